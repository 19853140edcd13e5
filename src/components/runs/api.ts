/**
 * Calls of the runs API from the browser, over the one fetch module: reads throw an
 * ApiRequestError (TanStack Query's query functions), actions answer an ApiResult for the screen.
 */
import { apiJson, requestJson, type ApiResult } from '@/components/query/fetch';
import type { PlotDataByKind, PlotKind, Run, RunComparison, RunList, SpectrumPlotData, SubmittedRuns } from './types';

const base = (id: string) => `/api/runs/${encodeURIComponent(id)}`;

/** Filters and page of the runs list, as the list endpoint names them. */
export interface RunListParams {
  /** Admins: the whole queue. */
  all?: boolean;
  mine?: boolean;
  status?: string;
  page: number;
  pageSize: number;
}

export function fetchRunList(params: RunListParams): Promise<RunList> {
  const search = new URLSearchParams({ page: String(params.page), page_size: String(params.pageSize) });
  if (params.all) search.set('all', '1');
  if (params.mine) search.set('mine', '1');
  if (params.status) search.set('status', params.status);
  return apiJson<RunList>('GET', `/api/runs?${search}`);
}

export function fetchRun(id: string): Promise<Run> {
  return apiJson<Run>('GET', base(id));
}

/** Reduced plot data of one probe: never more than `width` points per row (px). */
export function fetchPlot<K extends PlotKind>(id: string, probe: string, kind: K, width: number): Promise<PlotDataByKind[K]> {
  const search = new URLSearchParams({ probe, kind, width: String(width) });
  return apiJson<PlotDataByKind[K]>('GET', `${base(id)}/plot?${search}`);
}

/** Every bin of one probe's spectrum (what markers snap to); fetched only once a marker is placed. */
export function fetchSpectrumBins(id: string, probe: string): Promise<SpectrumPlotData> {
  const search = new URLSearchParams({ probe, kind: 'spectrum', full: '1' });
  return apiJson<SpectrumPlotData>('GET', `${base(id)}/plot?${search}`);
}

/** Spectra (at most `width` points each, px) and readouts of two or more runs. */
export function fetchComparison(ids: string[], width: number): Promise<RunComparison> {
  const search = new URLSearchParams({ ids: ids.join(','), width: String(width) });
  return apiJson<RunComparison>('GET', `/api/runs/compare?${search}`);
}

export function cancelRun(id: string): Promise<ApiResult<Run>> {
  return requestJson<Run>('POST', `${base(id)}/cancel`);
}

export function retryRun(id: string): Promise<ApiResult<SubmittedRuns>> {
  return requestJson<SubmittedRuns>('POST', `${base(id)}/retry`);
}

/** Asks for one run per capture of a chain revision (latest when `revision` is absent). */
export function submitRuns(chainId: string, revision: number | undefined, captureIds: string[]): Promise<SubmittedRuns> {
  const body: Record<string, unknown> = { chain_id: chainId };
  if (revision !== undefined) body.revision = revision;
  if (captureIds.length === 1) body.capture_id = captureIds[0];
  else body.capture_ids = captureIds;
  return apiJson<SubmittedRuns>('POST', '/api/runs', body);
}

/** Formats GET /api/runs/:id/export answers. */
export type ExportFormat = 'json' | 'csv-spectrum' | 'csv-readouts' | 'sigmf-meta' | 'sigmf-data';

/** Address of a download of a succeeded run's results. */
export function exportUrl(id: string, format: ExportFormat, probe?: string): string {
  const search = new URLSearchParams({ format });
  if (probe) search.set('probe', probe);
  return `${base(id)}/export?${search}`;
}

/** Address of the live status stream of a run. */
export function eventsUrl(id: string): string {
  return `${base(id)}/events`;
}
