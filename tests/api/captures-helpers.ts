/**
 * Helpers for the captures API tests: signed-in clients, raw byte uploads (the test Client sends
 * text bodies only), sample data of any SigMF datatype, and what the server left on disk.
 */
import { createHash, randomBytes } from 'node:crypto';
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';
import { Client } from '../helpers/client';
import type { TestServer } from '../helpers/server';
import { demoPassword } from '@/lib/server/seed';

/** A client signed in as a demo account. */
export async function signedIn(server: TestServer, email: string): Promise<Client> {
  const client = new Client(server.baseUrl);
  expect((await client.signIn(email, demoPassword)).status).toBe(200);
  return client;
}

/** The Cookie header of a client. */
export function cookieOf(client: Client): string {
  return [...client.cookies].map(([name, value]) => `${name}=${value}`).join('; ');
}

export interface RawResponse {
  status: number;
  headers: Headers;
  body: any;
  bytes: Uint8Array;
}

/** Any request with a binary (or streamed) body; JSON answers are parsed into `body`. */
export async function send(
  client: Client,
  method: string,
  path: string,
  options: { body?: Uint8Array | ReadableStream<Uint8Array>; headers?: Record<string, string> } = {},
): Promise<RawResponse> {
  const headers: Record<string, string> = { cookie: cookieOf(client), origin: client.baseUrl, ...options.headers };
  const init: RequestInit & { duplex?: 'half' } = { method, headers, body: options.body as BodyInit | undefined };
  if (options.body instanceof ReadableStream) init.duplex = 'half';
  const response = await fetch(client.baseUrl + path, init);
  const bytes = new Uint8Array(await response.arrayBuffer());
  let body: unknown = null;
  if (bytes.length > 0 && (response.headers.get('content-type') ?? '').includes('json')) body = JSON.parse(new TextDecoder().decode(bytes));
  return { status: response.status, headers: response.headers, body, bytes };
}

/** POST /api/captures with `bytes` as the body and `params` in the query string. */
export function upload(client: Client, bytes: Uint8Array, params: Record<string, string | number>, headers: Record<string, string> = {}) {
  const query = new URLSearchParams(Object.entries(params).map(([key, value]) => [key, String(value)]));
  return send(client, 'POST', `/api/captures?${query}`, { body: bytes, headers: { 'content-type': 'application/octet-stream', ...headers } });
}

/** The same, but streamed in `chunk`-byte pieces with no Content-Length (chunked transfer). */
export function uploadStreamed(client: Client, bytes: Uint8Array, params: Record<string, string | number>, chunk = 7_919) {
  let at = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (at >= bytes.length) return controller.close();
      controller.enqueue(bytes.slice(at, at + chunk));
      at += chunk;
    },
  });
  const query = new URLSearchParams(Object.entries(params).map(([key, value]) => [key, String(value)]));
  return send(client, 'POST', `/api/captures?${query}`, { body, headers: { 'content-type': 'application/octet-stream' } });
}

/** The capture's stored bytes. */
export async function download(client: Client, id: string): Promise<Uint8Array> {
  const response = await send(client, 'GET', `/api/captures/${id}/data`);
  expect(response.status).toBe(200);
  return response.bytes;
}

export function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/**
 * `samples` samples of a SigMF datatype and layout: random codes for integer types, random
 * finite values in [-1, 1) for float types (written with the datatype's byte order).
 */
export function sampleBytes(datatype: string, layout: 'complex' | 'real' | 'real-pair', samples: number): Uint8Array {
  const match = /^[rc]([fiu])(8|16|32|64)(?:_(le|be))?$/.exec(datatype)!;
  const kind = match[1];
  const width = Number(match[2]) / 8;
  const values = samples * (layout === 'real' ? 1 : 2);
  const bytes = randomBytes(values * width);
  if (kind === 'f') {
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    const little = match[3] !== 'be';
    for (let k = 0; k < values; k++) {
      const value = Math.random() * 2 - 1;
      if (width === 4) view.setFloat32(k * 4, value, little);
      else view.setFloat64(k * 8, value, little);
    }
  }
  return new Uint8Array(bytes);
}

/** Every file below the data folder's `objects` (temporary dot-files included), relative paths. */
export function storedObjects(server: TestServer): string[] {
  return filesBelow(join(server.dataDir, 'objects'));
}

/** Every file below the data folder's `uploads` (partial resumable uploads). */
export function partialUploads(server: TestServer): string[] {
  return filesBelow(join(server.dataDir, 'uploads'));
}

function filesBelow(folder: string, prefix = ''): string[] {
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return [];
  }
  return names.flatMap((name) => {
    const path = join(folder, name);
    return statSync(path).isDirectory() ? filesBelow(path, `${prefix}${name}/`) : [`${prefix}${name}`];
  });
}

/** Number of capture rows. */
export async function captureCount(server: TestServer): Promise<number> {
  const row = await server.db('captures').count<{ count: number }[]>({ count: '*' }).first();
  return Number(row?.count ?? 0);
}

/** Asserts that a refused request changed neither the table nor the stored objects. */
export async function expectNothingLeft(server: TestServer, before: { rows: number; objects: string[] }): Promise<void> {
  expect(await captureCount(server)).toBe(before.rows);
  // The store may still be unlinking a temporary file when the answer arrives.
  for (let attempt = 0; attempt < 20 && storedObjects(server).length !== before.objects.length; attempt++) {
    await new Promise((wake) => setTimeout(wake, 50));
  }
  expect(storedObjects(server)).toEqual(before.objects);
}

/** Rows and objects now, for expectNothingLeft. */
export async function snapshot(server: TestServer): Promise<{ rows: number; objects: string[] }> {
  return { rows: await captureCount(server), objects: storedObjects(server) };
}
