/**
 * Results filed before summaries and per-probe previews existed get them once, at start-up, before
 * the server answers: afterwards no request needs the whole results document.
 */
import type { Knex } from 'knex';
import { finiteJsonNumbers, runResultsSchema } from '@/dsp/chain/results';
import { probeDataEntries, summarizeResults } from './probe-data';
import { insertProbeData } from './transitions';

/** Fills in the summary and probe data of every result without one; answers how many it filled. */
export async function backfillResultSummaries(db: Knex): Promise<number> {
  let filled = 0;
  let after = '';
  for (;;) {
    const rows = (await db('run_results').whereNull('summary').where('id', '>', after).orderBy('id').limit(20).select('id', 'results')) as { id: string; results: string }[];
    if (rows.length === 0) return filled;
    for (const row of rows) {
      after = row.id;
      const parsed = runResultsSchema.safeParse(JSON.parse(row.results));
      if (!parsed.success) {
        // Left without a summary, the run page says it has no results; the JSON export still works.
        console.error(`Result ${row.id}: stored results do not match the results schema, no summary made:`, parsed.error.issues[0]);
        continue;
      }
      await db.transaction(async (trx) => {
        await trx('run_probe_data').where({ result_id: row.id }).delete();
        await insertProbeData(trx, row.id, probeDataEntries(parsed.data));
        await trx('run_results').where({ id: row.id }).update({ summary: JSON.stringify(summarizeResults(parsed.data), finiteJsonNumbers) });
      });
      filled++;
    }
  }
}
