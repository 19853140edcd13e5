/**
 * Starts the BUILT server (dist/server/entry.mjs, made by `astro build`) on a free port with a
 * temporary data folder, so API tests exercise real endpoints, real migrations and a real database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { Knex } from 'knex';
import { resetConfig } from '@/lib/config';
import { openDb } from '@/lib/server/db';
import { migrateToLatest } from '@/lib/server/db/migration-source';
import { seedDemo } from '@/lib/server/seed';
import { freePort } from './free-port';

// QUADRILLE_TEST_ENTRY points at another build (one engineer's outDir) without touching dist/.
const entry = resolve(process.env.QUADRILLE_TEST_ENTRY ?? 'dist/server/entry.mjs');
/** Our HTTP server around the built app (request timeouts fit long uploads). */
const serveScript = resolve('scripts/serve.mjs');

export interface TestServer {
  /** e.g. http://127.0.0.1:40123 */
  baseUrl: string;
  dataDir: string;
  /** A handle on the server's database, for checking what a request changed. */
  db: Knex;
  stop(): Promise<void>;
}

export interface StartOptions {
  /** Seed the demo accounts first (default true). */
  demo?: boolean;
  env?: Record<string, string>;
}

/** Starts the built server; resolves once /api/health answers 200. */
export async function startServer(options: StartOptions = {}): Promise<TestServer> {
  if (!existsSync(entry)) throw new Error('dist/server/entry.mjs is missing: run `npx astro build` first (npm test does).');
  const dataDir = mkdtempSync(join(tmpdir(), 'quadrille-test-'));
  const db = openDb(dataDir);
  // Migrating here as well lets the seed run before the server's first request.
  await migrateToLatest(db);
  // The seed runs in this process: read the environment again, as a test may have just changed it.
  resetConfig();
  if (options.demo ?? true) await seedDemo(db);
  const port = await freePort();
  const child = spawn(process.execPath, [serveScript, entry], {
    env: { ...process.env, ...options.env, QUADRILLE_DATA_DIR: dataDir, HOST: '127.0.0.1', PORT: String(port), NODE_ENV: 'test' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk) => (output += chunk));
  child.stderr?.on('data', (chunk) => (output += chunk));
  const baseUrl = `http://127.0.0.1:${port}`;
  try {
    await waitUntilReady(baseUrl, child);
  } catch (error) {
    child.kill();
    throw new Error(`${(error as Error).message}\n--- server output ---\n${output}`);
  }
  return {
    baseUrl,
    dataDir,
    db,
    async stop() {
      await db.destroy();
      await stopProcess(child);
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

async function waitUntilReady(baseUrl: string, child: ChildProcess, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}`);
    try {
      const response = await fetch(`${baseUrl}/api/health`);
      if (response.ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((wake) => setTimeout(wake, 100));
  }
  throw new Error(`server did not answer within ${timeoutMs} ms`);
}

function stopProcess(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return Promise.resolve();
  return new Promise((done) => {
    child.once('exit', () => done());
    child.kill('SIGTERM');
  });
}
