import { usePlotTheme } from '../plots/plot-theme';
import { isLargeDifference, runColour } from './compare-figures';
import { ReadoutValue } from './ReadoutValue';
import type { ComparedReadout, RunComparison } from './types';

/** Unit of a difference: levels and ratios in dB differ by dB, other units by themselves. */
function differenceUnit(unit: string): string {
  return unit.startsWith('dB') ? 'dB' : unit;
}

/**
 * Readouts of the compared runs side by side: the baseline's value, then for each further run its
 * value and its difference from the baseline, large differences marked.
 */
export function CompareReadouts({ comparison }: { comparison: RunComparison }) {
  const theme = usePlotTheme();
  const runs = comparison.runs;
  const rows = comparison.readouts;
  if (rows.length === 0) return <p className="text-sm text-muted">None of these runs has readouts.</p>;
  let previousProbe = '';
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="compare-readouts">
        <caption className="sr-only">Readouts of each run and their differences from the first run</caption>
        <thead className="border-b border-line text-left text-xs text-muted">
          <tr>
            <th scope="col" className="py-2 pr-3 font-medium uppercase tracking-wide">
              Probe
            </th>
            <th scope="col" className="py-2 pr-3 font-medium uppercase tracking-wide">
              Measurement
            </th>
            {runs.map((run, index) => (
              <RunHeaders key={run.id} name={run.capture.name} colour={runColour(theme, index)} baseline={index === 0} />
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => {
            const showProbe = row.probe !== previousProbe;
            previousProbe = row.probe;
            return (
              <tr key={`${row.probe}\u0000${row.name}\u0000${row.unit}`} className={'border-line/60 ' + (showProbe ? 'border-t' : '')} data-readout={row.name}>
                <td className="py-1.5 pr-3 align-baseline font-mono text-xs text-muted">{showProbe ? row.probe : ''}</td>
                <th scope="row" className="whitespace-nowrap py-1.5 pr-3 text-left align-baseline font-normal">
                  {row.name}
                </th>
                {runs.map((run, index) => (
                  <RunCells key={run.id} row={row} runId={run.id} baseline={index === 0} />
                ))}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function RunHeaders({ name, colour, baseline }: { name: string; colour: string; baseline: boolean }) {
  const title = (
    <span className="flex max-w-[14rem] items-start justify-end gap-1.5 whitespace-normal text-right font-medium text-ink">
      <span aria-hidden="true" className="mt-1.5 h-1 w-3 shrink-0 rounded-full" style={{ background: colour }} />
      {name}
    </span>
  );
  return (
    <>
      <th scope="col" className="py-2 pl-4 pr-3 align-bottom">
        {title}
      </th>
      {!baseline && (
        <th scope="col" className="py-2 pr-3 text-right align-bottom font-medium">
          Δ
        </th>
      )}
    </>
  );
}

function RunCells({ row, runId, baseline }: { row: ComparedReadout; runId: string; baseline: boolean }) {
  const value = row.values[runId] ?? null;
  const difference = row.differences[runId] ?? null;
  const base = row.baseline !== null ? (row.values[row.baseline] ?? null) : null;
  const large = !baseline && row.baseline !== runId && isLargeDifference(row.unit, difference, base);
  return (
    <>
      <td className="py-1.5 pl-4 pr-3 text-right align-baseline">
        <ReadoutValue value={value} unit={row.unit} reason={row.reasons?.[runId]} />
      </td>
      {!baseline && (
        <td
          className={'py-1.5 pr-3 text-right align-baseline ' + (large ? 'bg-accent/10 font-semibold' : 'text-muted')}
          data-large-difference={large || undefined}
          title={large ? 'Large difference from the baseline run' : undefined}
        >
          {row.baseline === runId ? (
            <span className="text-xs text-muted" title="The first run has no value; differences are taken against this one">
              baseline
            </span>
          ) : (
            <>
              <ReadoutValue value={difference} unit={differenceUnit(row.unit)} signed />
              {large && <span className="sr-only"> (large difference)</span>}
            </>
          )}
        </td>
      )}
    </>
  );
}
