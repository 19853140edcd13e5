/** Calls of the captures API from the browser; every failure comes back as the API's error. */
import { requestJson, type ApiResult } from '../forms/api';
import type { Capture, CaptureList } from './types';

/** Filters, sort and page of the captures list, as the list endpoint names them. */
export interface CaptureListParams {
  q?: string;
  owner?: string;
  tag?: string;
  layout?: string;
  datatype?: string;
  /** Hz. */
  minRate?: number;
  /** Hz. */
  maxRate?: number;
  sort: 'name' | 'createdAt' | 'byteSize' | 'sampleRate';
  order: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

/** Query string of a list request; empty filters are left out. */
export function listQueryString(params: CaptureListParams): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value === undefined || value === '' || (typeof value === 'number' && !Number.isFinite(value))) continue;
    search.set(key, String(value));
  }
  return search.toString();
}

/** One page of captures; throws an Error carrying the API's message so TanStack Query shows it. */
export async function fetchCaptureList(params: CaptureListParams): Promise<CaptureList> {
  const result = await requestJson<CaptureList>('GET', `/api/captures?${listQueryString(params)}`);
  if (!result.ok) throw new Error(result.error.message);
  return result.data;
}

export function deleteCapture(id: string): Promise<ApiResult<null>> {
  return requestJson<null>('DELETE', `/api/captures/${encodeURIComponent(id)}`);
}

/** Answer of the bulk delete: what went, and what was refused with the reason's code. */
export interface BulkDeleteResult {
  deleted: string[];
  refused: { id: string; code: string }[];
}

export function bulkDeleteCaptures(ids: string[]): Promise<ApiResult<BulkDeleteResult>> {
  return requestJson<BulkDeleteResult>('POST', '/api/captures/bulk-delete', { ids });
}

/** Fields the owner may change. */
export interface CaptureChanges {
  name?: string;
  notes?: string;
  tags?: string[];
  visibility?: 'private' | 'team';
  centerFrequency?: number | null;
  annotations?: Record<string, unknown>[];
}

/** One capture as the API presents it; throws an Error carrying the API's message so TanStack Query shows it. */
export async function fetchCapture(id: string): Promise<Capture> {
  const result = await requestJson<Capture>('GET', `/api/captures/${encodeURIComponent(id)}`);
  if (!result.ok) throw new Error(result.error.message);
  return result.data;
}

export function updateCapture(id: string, changes: CaptureChanges): Promise<ApiResult<Capture>> {
  return requestJson<Capture>('PATCH', `/api/captures/${encodeURIComponent(id)}`, changes);
}

/** Event the upload and synthesis islands send so the captures table reloads. */
export const CAPTURES_CHANGED = 'quadrille:captures-changed';

/** Tells other islands on the page that the captures changed. */
export function announceCapturesChanged(): void {
  window.dispatchEvent(new CustomEvent(CAPTURES_CHANGED));
}
