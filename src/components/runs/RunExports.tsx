import { buttonSmall } from '../ui';
import { exportUrl } from './api';
import type { RunSummary } from './types';

/**
 * Downloads of a succeeded run: results.json, readouts and each spectrum as CSV, the output
 * capture as a SigMF pair (metadata and data files). PNGs are on each plot.
 */
export function RunExports({ runId, summary }: { runId: string; summary: RunSummary }) {
  const spectra = summary.testPoints.filter((p) => p.spectrum);
  const hasReadouts = summary.testPoints.some((p) => p.readouts.length > 0);
  const link = (href: string, text: string, title: string) => (
    <a className={buttonSmall} href={href} download title={title}>
      {text}
    </a>
  );
  return (
    <section aria-labelledby="exports-title" className="rounded-lg border border-line bg-panel p-4" data-testid="run-exports">
      <h2 id="exports-title" className="font-semibold">
        Exports
      </h2>
      <dl className="mt-2 grid grid-cols-[auto_1fr] items-center gap-x-4 gap-y-2 text-sm">
        <dt className="text-muted">Results</dt>
        <dd className="flex flex-wrap gap-1.5">
          {link(exportUrl(runId, 'json'), 'results.json', 'Everything the run produced, in the command line’s results.json shape')}
        </dd>
        {hasReadouts && (
          <>
            <dt className="text-muted">Readouts</dt>
            <dd className="flex flex-wrap gap-1.5">{link(exportUrl(runId, 'csv-readouts'), 'CSV', 'Probe, measurement, value and unit, one row each')}</dd>
          </>
        )}
        {spectra.length > 0 && (
          <>
            <dt className="text-muted">Spectra</dt>
            <dd className="flex flex-wrap gap-1.5">
              {spectra.map((p) => (
                <span key={p.stageId}>
                  {link(
                    exportUrl(runId, 'csv-spectrum', p.stageId),
                    spectra.length > 1 ? `${p.stageId} CSV` : 'CSV',
                    `Every bin of the spectrum at ${p.stageId}: frequency (Hz) and level`,
                  )}
                </span>
              ))}
            </dd>
          </>
        )}
        <dt className="text-muted">Output capture</dt>
        <dd className="flex flex-wrap items-center gap-1.5">
          {link(exportUrl(runId, 'sigmf-meta'), '.sigmf-meta', 'SigMF metadata of the chain’s output')}
          {link(exportUrl(runId, 'sigmf-data'), '.sigmf-data', 'The output samples (SigMF data file)')}
          {summary.output && (
            <span className="font-mono text-xs text-muted">
              {summary.output.datatype}, {summary.output.samples.toLocaleString('en')} samples
            </span>
          )}
        </dd>
      </dl>
    </section>
  );
}
