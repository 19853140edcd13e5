import { quantityParts, type QuantityOptions } from '@/lib/units';

export interface QuantityProps extends QuantityOptions {
  /** The value in the base unit (Hz, s, B, dB...). */
  value: number;
  /** Base unit without prefix: 'Hz', 'sps', 's', 'B', 'dB', 'dBFS'... */
  unit: string;
  className?: string;
}

/** A number with its unit and SI prefix in the monospace face; the exact value shows on hover. */
export function Quantity({ value, unit, className, ...options }: QuantityProps) {
  const parts = quantityParts(value, unit, options);
  const exact = Number.isFinite(value) ? `${value} ${unit}` : undefined;
  return (
    <span
      className={['font-mono tabular-nums whitespace-nowrap', className].filter(Boolean).join(' ')}
      title={exact}
      data-quantity={value}
    >
      {parts.number}
      {parts.unit && (
        <span className="text-muted">
          {unit === '°' ? '' : ' '}
          {parts.unit}
        </span>
      )}
    </span>
  );
}
