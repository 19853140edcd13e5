import { Quantity } from '../Quantity';

/** Display options of a readout value: frequencies keep more digits (a tone at 600.012 kHz). */
function quantityOptions(unit: string): { significant?: number } {
  return unit === 'Hz' ? { significant: 7 } : {};
}

/** Text of a full-scale amplitude: "0.01234", four significant digits, never an SI prefix ("12 mFS" reads badly). */
export function fullScaleText(value: number): string {
  if (value === 0) return '0';
  const text = Math.abs(value) < 1e-4 ? value.toExponential(3) : value.toPrecision(4);
  return text.includes('e') ? text : text.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
}

/** A readout value with its unit in the monospace face; null shows a dash. */
export function ReadoutValue({ value, unit, signed, reason }: { value: number | null; unit: string; signed?: boolean; reason?: string }) {
  if (value === null || !Number.isFinite(value)) {
    return (
      <span className="font-mono text-muted" title={reason ?? 'Not measurable on this capture'}>
        —
      </span>
    );
  }
  if (unit === 'FS') {
    return (
      <span className="whitespace-nowrap font-mono tabular-nums" title={`${value} FS`} data-quantity={value}>
        {signed && value > 0 ? '+' : ''}
        {fullScaleText(value)}
        <span className="text-muted"> FS</span>
      </span>
    );
  }
  return <Quantity value={value} unit={unit} signed={signed} {...quantityOptions(unit)} />;
}
