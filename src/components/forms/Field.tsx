import { useId, type InputHTMLAttributes, type Ref } from 'react';
import { input as inputClass, label as labelClass } from '../ui';

interface FieldProps extends InputHTMLAttributes<HTMLInputElement> {
  label: string;
  /** The problem with this field, shown beside it and announced to screen readers. */
  error?: string | null;
  /** A short hint under the input. */
  hint?: string;
  ref?: Ref<HTMLInputElement>;
}

/** A labelled text input with its hint and its error message right under it. */
export function Field({ label, error, hint, id, ref, ...inputProps }: FieldProps) {
  const autoId = useId();
  const inputId = id ?? autoId;
  const hintId = hint && !error ? inputId + '-hint' : undefined;
  const errorId = error ? inputId + '-error' : undefined;
  return (
    <div>
      <label htmlFor={inputId} className={labelClass}>
        {label}
      </label>
      <input
        ref={ref}
        id={inputId}
        className={inputClass}
        aria-invalid={error ? true : undefined}
        aria-describedby={[errorId, hintId].filter(Boolean).join(' ') || undefined}
        {...inputProps}
      />
      {hintId && (
        <p id={hintId} className="mt-1 text-xs text-muted">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="mt-1 text-sm text-danger" data-field-error={inputProps.name}>
          {error}
        </p>
      )}
    </div>
  );
}

/** A message that belongs to the whole form rather than to one field. */
export function FormMessage({ tone, children }: { tone: 'error' | 'ok'; children: string }) {
  return (
    <p
      role={tone === 'error' ? 'alert' : 'status'}
      className={
        'rounded-md border px-3 py-2 text-sm ' +
        (tone === 'error' ? 'border-danger/40 bg-danger/10 text-danger' : 'border-ok/40 bg-ok/10 text-ok')
      }
    >
      {children}
    </p>
  );
}
