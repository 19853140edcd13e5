import { Readable } from 'node:stream';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { getDb } from '@/lib/server/db';
import { getObjectStore } from '@/lib/server/captures/store';
import { loadRunFor, readoutsCsv, resultRowOf, spectrumCsv, type RunResults } from '@/lib/server/runs';
import { ExportQuery } from '@/lib/server/runs/fields';

function download(body: BodyInit, type: string, filename: string, extra: Record<string, string> = {}): Response {
  return new Response(body, {
    headers: { 'Content-Type': type, 'Content-Disposition': `attachment; filename="${filename}"`, 'Cache-Control': 'no-store', ...extra },
  });
}

/**
 * A succeeded run's results as a file: `json` (results.json), `csv-spectrum` (one spectrum,
 * `&probe=` to choose), `csv-readouts`, or the output capture as a SigMF pair (`sigmf-meta`, `sigmf-data`).
 */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.export');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.export');
  const query = parseWith(ExportQuery, Object.fromEntries(context.url.searchParams));
  const row = await resultRowOf(db, run);
  const base = `run-${run.id.slice(0, 8)}`;
  switch (query.format) {
    case 'json':
      return download(`${JSON.stringify(JSON.parse(row.results), null, 2)}\n`, 'application/json; charset=utf-8', `${base}-results.json`);
    case 'csv-spectrum': {
      const { probe, csv } = spectrumCsv(JSON.parse(row.results) as RunResults, query.probe);
      return download(csv, 'text/csv; charset=utf-8', `${base}-spectrum-${probe}.csv`);
    }
    case 'csv-readouts':
      return download(readoutsCsv(JSON.parse(row.results) as RunResults), 'text/csv; charset=utf-8', `${base}-readouts.csv`);
    case 'sigmf-meta':
      return download(row.output_meta, 'application/json; charset=utf-8', `${base}-output.sigmf-meta`);
    case 'sigmf-data': {
      const read = await getObjectStore().get(row.output_key);
      const body = Readable.toWeb(read.stream) as unknown as ReadableStream<Uint8Array>;
      return download(body, 'application/octet-stream', `${base}-output.sigmf-data`, { 'Content-Length': String(read.length) });
    }
  }
});
