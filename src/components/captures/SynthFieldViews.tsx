/**
 * Renders the synthesizer's field model: numbers as text fields with their unit (SI prefixes
 * allowed), choices as selects, lists (tones, carriers) as repeatable groups, and variants (noise
 * mode, modulation) as a choice that swaps in the chosen variant's fields with their defaults.
 */
import { useId } from 'react';
import { get, useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { buttonSmall } from '../ui';
import { newItemValues, type FieldModel } from './synth-form-schema';

const control = 'block w-full min-w-0 rounded-md border border-muted/40 bg-surface px-2.5 py-1.5 text-sm text-ink focus:border-accent aria-[invalid=true]:border-danger';

const CHOICE_LABELS: Record<string, string> = {
  complex: 'Complex I/Q',
  real: 'Real IF',
  'real-pair': 'Two real channels',
  bpsk: 'BPSK',
  qpsk: 'QPSK',
  qam16: '16-QAM',
  am: 'AM by a tone',
  fm: 'FM by a tone',
  off: 'Off',
  total: 'Total level',
  snr: 'SNR',
};

/** One field of the model under the form name `name`. */
export function FieldView({ field, name }: { field: FieldModel; name: string }) {
  switch (field.kind) {
    case 'number':
    case 'text':
    case 'choice':
    case 'flag':
      return <LeafField field={field} name={name} />;
    case 'group':
      return (
        <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3 min-[1920px]:grid-cols-4">
          {field.fields.map((f) => (
            <FieldView key={f.key} field={f} name={`${name}.${f.key}`} />
          ))}
        </div>
      );
    case 'list':
      return <ListField field={field} name={name} />;
    case 'variants':
      return <VariantField field={field} name={name} />;
  }
}

function LeafField({ field, name }: { field: Extract<FieldModel, { kind: 'number' | 'text' | 'choice' | 'flag' }>; name: string }) {
  const { register, formState } = useFormContext();
  const id = useId();
  const error = (get(formState.errors, name) as { message?: string } | undefined)?.message;
  const describedBy = [error ? `${id}-error` : '', field.help ? `${id}-help` : ''].filter(Boolean).join(' ') || undefined;
  if (field.kind === 'flag') {
    return (
      <div className="flex items-start gap-2 self-end pb-1.5">
        <input id={id} type="checkbox" className="mt-0.5 h-4 w-4 accent-[rgb(var(--q-accent))]" aria-describedby={describedBy} {...register(name)} />
        <div>
          <label htmlFor={id} className="text-sm font-medium">
            {field.label}
          </label>
          {field.help && <p id={`${id}-help`} className="text-xs text-muted">{field.help}</p>}
        </div>
      </div>
    );
  }
  const unit = field.kind === 'number' ? field.unit : undefined;
  return (
    <div className="min-w-0">
      <label htmlFor={id} className="mb-1 block text-sm font-medium">
        {field.label}
        {unit && <span className="font-normal text-muted"> ({unit})</span>}
      </label>
      {field.kind === 'choice' ? (
        <select id={id} className={control + (field.key === 'datatype' ? ' font-mono' : '')} aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...register(name)} disabled={field.options.length < 2}>
          {field.options.map((o) => (
            <option key={o} value={o}>
              {CHOICE_LABELS[o] ?? o}
            </option>
          ))}
        </select>
      ) : (
        <input
          id={id}
          className={control + (field.kind === 'number' ? ' font-mono' : '')}
          inputMode={field.kind === 'number' ? 'text' : undefined}
          autoComplete="off"
          spellCheck={false}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          {...register(name)}
        />
      )}
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-xs text-danger" data-field-error={name}>
          {error}
        </p>
      ) : (
        field.help && (
          <p id={`${id}-help`} className="mt-1 text-xs text-muted">
            {field.help}
          </p>
        )
      )}
    </div>
  );
}

function ListField({ field, name }: { field: Extract<FieldModel, { kind: 'list' }>; name: string }) {
  const { control: formControl, formState } = useFormContext();
  const { fields, append, remove } = useFieldArray({ control: formControl, name });
  const listError = (get(formState.errors, name) as { message?: string } | undefined)?.message;
  const singular = field.label.replace(/s$/, '').toLowerCase();
  const firstTag = field.item.kind === 'variants' ? Object.keys(field.item.variants).find((t) => t === 'qpsk') ?? Object.keys(field.item.variants)[0] : undefined;
  return (
    <div className="space-y-3">
      {fields.length === 0 && <p className="text-sm text-muted">None.</p>}
      {fields.map((item, index) => (
        <fieldset key={item.id} className="rounded-md border border-line bg-surface/60 p-3">
          <legend className="sr-only">{`${field.label}: item ${index + 1}`}</legend>
          <div className="mb-2 flex items-center justify-between">
            <span className="text-xs font-medium uppercase tracking-wide text-muted">
              {singular} {index + 1}
            </span>
            <button type="button" className={buttonSmall} onClick={() => remove(index)} aria-label={`Remove ${singular} ${index + 1}`}>
              Remove
            </button>
          </div>
          <FieldView field={field.item} name={`${name}.${index}`} />
        </fieldset>
      ))}
      {listError && <p className="text-xs text-danger">{listError}</p>}
      <button type="button" className={buttonSmall} disabled={field.max !== undefined && fields.length >= field.max} onClick={() => append(newItemValues(field.item, firstTag) as Record<string, unknown>)}>
        Add {singular}
      </button>
    </div>
  );
}

function VariantField({ field, name }: { field: Extract<FieldModel, { kind: 'variants' }>; name: string }) {
  const { register, setValue, getValues } = useFormContext();
  const id = useId();
  const tagName = `${name}.${field.discriminator}`;
  const tag = useWatch({ name: tagName }) as string;
  const fields = field.variants[tag] ?? [];
  const tagInfo = { label: field.discriminator === 'mode' ? field.label : 'Modulation' };
  const registration = register(tagName);
  return (
    <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3 min-[1920px]:grid-cols-4">
      <div>
        <label htmlFor={id} className="mb-1 block text-sm font-medium">
          {tagInfo.label}
        </label>
        <select
          id={id}
          className={control}
          {...registration}
          onChange={(event) => {
            const next = event.target.value;
            // Keep what the variants share (carrier frequency and level), take defaults for the rest.
            const previous = (getValues(name) ?? {}) as Record<string, unknown>;
            const fresh = newItemValues(field, next) as Record<string, unknown>;
            for (const key of Object.keys(fresh)) if (key !== field.discriminator && previous[key] !== undefined) fresh[key] = previous[key];
            setValue(name, fresh, { shouldValidate: true, shouldDirty: true });
          }}
        >
          {Object.keys(field.variants).map((o) => (
            <option key={o} value={o}>
              {CHOICE_LABELS[o] ?? o}
            </option>
          ))}
        </select>
      </div>
      {fields.map((f) => (
        <FieldView key={`${tag}-${f.key}`} field={f} name={`${name}.${f.key}`} />
      ))}
    </div>
  );
}
