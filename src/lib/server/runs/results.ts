/**
 * Reading a run's results back without parsing the whole document: the result row a succeeded run
 * points at, its summary, and one probe's stored plot data (the preview, or every bin of a
 * spectrum). Only the JSON export sends the results document, as stored text.
 */
import type { Knex } from 'knex';
import type { PlotData, PlotKind, RunSummary, SpectrumPlotData } from '@/contracts/run-results';
import { ApiError, notFound } from '../api/errors';
import type { RunProbeDataRow, RunResultRow, RunView } from './rows';

/** 409 for a run that has no results (yet, or ever). */
export function noResults(run: Pick<RunView, 'status'>): ApiError {
  return new ApiError(409, 'no_results', `This run is ${run.status}; only a succeeded run has results.`);
}

/** The result row of a succeeded run (without the results text unless asked); 409 `no_results` otherwise. */
export async function resultRowOf(db: Knex, run: RunView, columns: (keyof RunResultRow)[] = ['id', 'output_key', 'output_meta', 'summary']): Promise<RunResultRow> {
  if (run.status !== 'succeeded' || !run.result_id) throw noResults(run);
  const row = (await db('run_results').where({ id: run.result_id }).first(columns)) as RunResultRow | undefined;
  if (!row) throw noResults(run);
  return row;
}

/** Summaries of several results in one query, by result id (those filed before summaries existed are absent). */
export async function summariesOf(db: Knex, resultIds: string[]): Promise<Map<string, RunSummary>> {
  const summaries = new Map<string, RunSummary>();
  if (resultIds.length === 0) return summaries;
  const rows = (await db('run_results').whereIn('id', [...new Set(resultIds)]).whereNotNull('summary').select('id', 'summary')) as Pick<RunResultRow, 'id' | 'summary'>[];
  for (const row of rows) summaries.set(row.id, JSON.parse(row.summary!) as RunSummary);
  return summaries;
}

/** The summary of a succeeded run; 409 `no_results` otherwise. */
export async function summaryOf(db: Knex, run: RunView): Promise<RunSummary> {
  const row = await resultRowOf(db, run, ['id', 'summary']);
  if (row.summary === null) throw noResults(run);
  return JSON.parse(row.summary) as RunSummary;
}

/** One probe's stored data of one kind: the reduced preview, or `full` (every point); 404 naming `probe` when absent. */
export async function probePlotOf(db: Knex, run: RunView, probe: string, kind: PlotKind, full = false): Promise<PlotData> {
  if (run.status !== 'succeeded' || !run.result_id) throw noResults(run);
  const row = (await db('run_probe_data')
    .where({ result_id: run.result_id, stage_id: probe, kind })
    .first(full ? 'data' : 'preview')) as Partial<Pick<RunProbeDataRow, 'data' | 'preview'>> | undefined;
  if (!row) {
    const known = (await db('run_probe_data').where({ result_id: run.result_id, stage_id: probe }).first('kind')) as object | undefined;
    if (!known) throw new ApiError(404, 'not_found', `No probe "${probe}" in this run.`, 'probe');
    throw notFound(`${kind} for probe "${probe}"`);
  }
  return JSON.parse((full ? row.data : row.preview)!) as PlotData;
}

/** Stored spectrum previews of several results in one query: result id -> previews (any order). */
export async function spectrumPreviewsOf(db: Knex, resultIds: string[]): Promise<Map<string, SpectrumPlotData[]>> {
  const previews = new Map<string, SpectrumPlotData[]>();
  if (resultIds.length === 0) return previews;
  const rows = (await db('run_probe_data')
    .whereIn('result_id', [...new Set(resultIds)])
    .where({ kind: 'spectrum' })
    .select('result_id', 'stage_id', 'preview')) as Pick<RunProbeDataRow, 'result_id' | 'stage_id' | 'preview'>[];
  for (const row of rows) {
    const list = previews.get(row.result_id) ?? [];
    list.push(JSON.parse(row.preview) as SpectrumPlotData);
    previews.set(row.result_id, list);
  }
  return previews;
}
