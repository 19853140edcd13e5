import { Readable } from 'node:stream';
import type { SpectrumPlotData } from '@/contracts/run-results';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { getDb } from '@/lib/server/db';
import { getObjectStore } from '@/lib/server/captures/store';
import { loadRunFor, probePlotOf, readoutsCsv, resultRowOf, spectrumCsv, spectrumProbe, summaryOf } from '@/lib/server/runs';
import { ExportQuery } from '@/lib/server/runs/fields';

function download(body: BodyInit, type: string, filename: string, extra: Record<string, string> = {}): Response {
  return new Response(body, {
    headers: { 'Content-Type': type, 'Content-Disposition': `attachment; filename="${filename}"`, 'Cache-Control': 'no-store', ...extra },
  });
}

/**
 * A succeeded run's results as a file: `json` (results.json, as stored), `csv-spectrum` (one
 * spectrum, `&probe=` to choose), `csv-readouts`, or the output capture as a SigMF pair
 * (`sigmf-meta`, `sigmf-data`).
 */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.export');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.export');
  const query = parseWith(ExportQuery, Object.fromEntries(context.url.searchParams));
  const base = `run-${run.id.slice(0, 8)}`;
  switch (query.format) {
    case 'json': {
      const row = await resultRowOf(db, run, ['id', 'results']);
      return download(`${row.results}\n`, 'application/json; charset=utf-8', `${base}-results.json`);
    }
    case 'csv-spectrum': {
      const point = spectrumProbe(await summaryOf(db, run), query.probe);
      const spectrum = (await probePlotOf(db, run, point.stageId, 'spectrum', true)) as SpectrumPlotData;
      return download(spectrumCsv(spectrum), 'text/csv; charset=utf-8', `${base}-spectrum-${point.stageId}.csv`);
    }
    case 'csv-readouts':
      return download(readoutsCsv(await summaryOf(db, run)), 'text/csv; charset=utf-8', `${base}-readouts.csv`);
    case 'sigmf-meta': {
      const row = await resultRowOf(db, run, ['id', 'output_meta']);
      return download(row.output_meta, 'application/json; charset=utf-8', `${base}-output.sigmf-meta`);
    }
    case 'sigmf-data': {
      const row = await resultRowOf(db, run, ['id', 'output_key']);
      const read = await getObjectStore().get(row.output_key);
      const body = Readable.toWeb(read.stream) as unknown as ReadableStream<Uint8Array>;
      return download(body, 'application/octet-stream', `${base}-output.sigmf-data`, { 'Content-Length': String(read.length) });
    }
  }
});
