import { Quantity } from '../Quantity';
import { buttonSmall } from '../ui';
import { markerDifference, type Marker, type MarkerName } from './markers';
import type { FrequencyAxis } from './run-figures';

export interface MarkerPanelProps {
  markers: Partial<Record<MarkerName, Marker>>;
  /** The marker the next click places. */
  next: MarkerName;
  /** The spectrum's level unit (dBFS/Hz...). */
  unit: string;
  /** The plot's frequency axis: marker frequencies are shown in its unit (RF when the centre is known). */
  axis: FrequencyAxis;
  /** Spacing of the spectrum's bins (Hz), which decides the decimals worth showing. */
  binSpacing: number;
  onNext: (name: MarkerName) => void;
  /** Move a marker by `step` bins. */
  onStep: (name: MarkerName, step: number) => void;
  onPeak: (name: MarkerName) => void;
  onClear: () => void;
}

const NAMES: MarkerName[] = ['A', 'B'];

/** Readings of markers A and B and their difference, with buttons to choose, nudge and clear them. */
export function MarkerPanel({ markers, next, unit, axis, binSpacing, onNext, onStep, onPeak, onClear }: MarkerPanelProps) {
  const { A, B } = markers;
  const difference = A && B ? markerDifference(A, B) : null;
  // Differences of levels in a logarithmic unit are ratios: dB, whatever the level unit was.
  const deltaUnit = unit.startsWith('dB') ? 'dB' : unit;
  return (
    <div className="mt-3 flex flex-wrap items-start gap-x-8 gap-y-3 border-t border-line pt-3 text-sm" data-testid="marker-panel">
      <div className="space-y-2">
        <div className="flex items-center gap-2">
          <span className="text-muted">Click places</span>
          <div role="radiogroup" aria-label="Marker placed by the next click" className="inline-flex overflow-hidden rounded border border-line">
            {NAMES.map((name) => (
              <button
                key={name}
                type="button"
                role="radio"
                aria-checked={next === name}
                onClick={() => onNext(name)}
                className={'px-2.5 py-0.5 font-mono text-xs ' + (next === name ? 'bg-accent text-panel' : 'bg-panel text-ink hover:bg-surface')}
              >
                {name}
              </button>
            ))}
          </div>
          <button type="button" className="text-xs text-muted underline hover:text-ink disabled:opacity-50" onClick={onClear} disabled={!A && !B}>
            Clear
          </button>
        </div>
        <p className="max-w-[18rem] text-xs text-muted">Drag a marker line to move it; the markers snap to the bins of the full spectrum.</p>
      </div>
      <table className="text-sm" aria-label="Marker readings">
        <thead className="text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th scope="col" className="pr-4 font-medium">
              Marker
            </th>
            <th scope="col" className="pr-4 text-right font-medium">
              Frequency
            </th>
            <th scope="col" className="pr-4 text-right font-medium">
              Level
            </th>
            <th scope="col">
              <span className="sr-only">Move</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {NAMES.map((name) => {
            const marker = markers[name];
            return (
              <tr key={name} data-marker={name}>
                <th scope="row" className="py-0.5 pr-4 text-left font-mono font-semibold">
                  {name}
                </th>
                <td className="py-0.5 pr-4 text-right" data-testid={`marker-${name}-frequency`}>
                  {marker ? <AxisFrequency frequency={marker.frequency} axis={axis} binSpacing={binSpacing} /> : <span className="text-muted">—</span>}
                </td>
                <td className="py-0.5 pr-4 text-right" data-testid={`marker-${name}-level`}>
                  {marker && marker.level !== null ? <Quantity value={marker.level} unit={unit} /> : <span className="text-muted">—</span>}
                </td>
                <td className="py-0.5">
                  <div className="flex gap-1">
                    <button
                      type="button"
                      className={buttonSmall}
                      disabled={!marker}
                      onClick={() => onStep(name, -1)}
                      aria-label={`Move marker ${name} one bin down`}
                    >
                      ◀
                    </button>
                    <button
                      type="button"
                      className={buttonSmall}
                      disabled={!marker}
                      onClick={() => onStep(name, 1)}
                      aria-label={`Move marker ${name} one bin up`}
                    >
                      ▶
                    </button>
                    <button type="button" className={buttonSmall} onClick={() => onPeak(name)} title={`Put marker ${name} on the peak`}>
                      Peak
                    </button>
                  </div>
                </td>
              </tr>
            );
          })}
          <tr className="border-t border-line" data-testid="marker-difference">
            <th scope="row" className="py-0.5 pr-4 text-left font-mono font-semibold">
              B − A
            </th>
            <td className="py-0.5 pr-4 text-right">
              {difference ? (
                <span title="ΔF">
                  <span className="mr-1 text-xs text-muted">ΔF</span>
                  <Quantity value={difference.deltaFrequency} unit="Hz" signed significant={6} />
                </span>
              ) : (
                <span className="text-muted">—</span>
              )}
            </td>
            <td className="py-0.5 pr-4 text-right">
              {difference && difference.deltaLevel !== null ? (
                <span title="ΔL">
                  <span className="mr-1 text-xs text-muted">ΔL</span>
                  <Quantity value={difference.deltaLevel} unit={deltaUnit} signed />
                </span>
              ) : (
                <span className="text-muted">—</span>
              )}
            </td>
            <td />
          </tr>
        </tbody>
      </table>
    </div>
  );
}

/**
 * A marker frequency in the plot axis's unit with as many decimals as one bin resolves, so it reads
 * like the axis ("2,410.9971 MHz") rather than as a long GHz figure; the exact value in Hz on hover.
 */
function AxisFrequency({ frequency, axis, binSpacing }: { frequency: number; axis: FrequencyAxis; binSpacing: number }) {
  const value = (frequency + axis.offset) / axis.scale.divisor;
  const decimals = binSpacing > 0 ? Math.max(0, Math.min(9, Math.ceil(Math.log10(axis.scale.divisor / binSpacing)))) : 3;
  return (
    <span className="whitespace-nowrap font-mono tabular-nums" title={`${frequency + axis.offset} Hz`} data-quantity={frequency + axis.offset}>
      {value.toLocaleString('en', { minimumFractionDigits: decimals, maximumFractionDigits: decimals })}
      <span className="text-muted"> {axis.scale.unit}</span>
    </span>
  );
}
