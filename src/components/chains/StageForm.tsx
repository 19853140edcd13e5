/**
 * The parameter form of one stage cell, generated from the stage kind's schema and field labels:
 * react-hook-form holds the typed text, the zod resolver checks it with the engine's schema, and
 * every readable change goes straight into the document. A change that comes from elsewhere (the
 * JSON view, a restored revision) resets the form; the form's own changes never do, so the text
 * being typed is never rewritten under the cursor.
 */
import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { useForm, useWatch, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { ChainIssue, StageDefinition, StreamFormat } from '@/dsp/types';
import { hiddenFields, stageForm, switchVariant, type FieldSpec } from './field-model';
import { formValuesToParams, paramsToFormValues, type FormValues } from './form-values';
import { stageFormSchema } from './form-schema';
import { messageInCell, parameterOf } from './analysis';
import { roundNumber } from './draft';

interface StageFormProps {
  stageId: string;
  definition: StageDefinition<any>;
  params: Record<string, unknown>;
  input?: StreamFormat;
  /** Propagation problems of this stage (shown beside the field they name). */
  issues: ChainIssue[];
  readOnly: boolean;
  onChange(params: Record<string, unknown>): void;
}

const inputClass =
  'block w-full min-w-0 rounded border border-line bg-surface px-2 py-1 font-mono text-[13px] text-ink focus:border-accent disabled:opacity-70 aria-[invalid=true]:border-danger';

/** Seed values when a variant or response appears, read off the incoming rate. */
function rateSeed(input: StreamFormat | undefined, params: Record<string, unknown>): Record<string, unknown> {
  const rate = input?.sampleRate ?? 1e6;
  const cutoff = typeof params.cutoff === 'number' ? params.cutoff : roundNumber(rate / 8);
  return { cutoff, transition: roundNumber(rate / 50), low: roundNumber(cutoff / 2), high: cutoff, coefficients: [1] };
}

export default function StageForm({ stageId, definition, params, input, issues, readOnly, onChange }: StageFormProps) {
  const { variant, fields } = useMemo(() => stageForm(definition, params), [definition, params]);
  const fieldNames = fields.map((f) => f.name).join(',');
  const paramsRef = useRef(params);
  paramsRef.current = params;
  const onChangeRef = useRef(onChange);
  onChangeRef.current = onChange;
  const inputRef = useRef(input);
  inputRef.current = input;
  const emitted = useRef<string>(JSON.stringify(params));
  const resolver = useMemo(() => zodResolver(stageFormSchema(definition, fields, () => paramsRef.current)), [definition, fieldNames]); // eslint-disable-line react-hooks/exhaustive-deps
  const form = useForm<FormValues, unknown, Record<string, unknown>>({ defaultValues: paramsToFormValues(fields, params), resolver, mode: 'onChange' });
  const { register, reset, control, formState, trigger } = form;
  const values = useWatch({ control });
  // The help of the last focused field stays after the focus leaves: removing it on blur would shift
  // everything below, and a click on a button there (mouse down, layout moves, mouse up) would miss.
  const [focused, setFocused] = useState<string | null>(null);
  const formId = useId();

  // Changes from outside the form (JSON view, restore, variant switch) reload the form.
  useEffect(() => {
    const json = JSON.stringify(params);
    if (json === emitted.current) return;
    emitted.current = json;
    reset(paramsToFormValues(fields, params));
    void trigger();
  }, [params, fieldNames]); // eslint-disable-line react-hooks/exhaustive-deps

  // Every edit: read what can be read, keep the rest in the form with its error.
  useEffect(() => {
    const sub = form.watch((all, { name }) => {
      if (!name) return;
      let next = formValuesToParams(fields, all as FormValues, paramsRef.current).params;
      if (definition.kind === 'filter' && name === 'response' && (next.response === 'bandpass' || next.response === 'bandstop')) {
        const seed = rateSeed(inputRef.current, next);
        if (next.low === undefined) next = { ...next, low: seed.low };
        if (next.high === undefined) next = { ...next, high: seed.high };
      }
      // The resolver checks the whole form but RHF only refreshes the edited field's error: a
      // change of \`high\` must also clear (or raise) the error shown on \`low\`.
      void trigger();
      const json = JSON.stringify(next);
      if (json === JSON.stringify(paramsRef.current)) return;
      emitted.current = json;
      onChangeRef.current(next);
    });
    return () => sub.unsubscribe();
  }, [form, fields, definition, trigger]);

  useEffect(() => {
    void trigger();
  }, [trigger]);

  const hidden = hiddenFields(definition.kind, params);
  const visible = fields.filter((f) => !hidden.has(f.name));
  const fieldIssue = (name: string) => issues.find((i) => parameterOf(i) === name);
  const help = focused ? fields.find((f) => f.name === focused)?.help ?? definition.fields[focused]?.help : undefined;

  return (
    <form id={formId} className="min-w-0" onSubmit={(e) => e.preventDefault()}
      aria-label={`Parameters of ${stageId}`} data-stage-form={stageId}>
      <fieldset disabled={readOnly} className="grid grid-cols-[repeat(auto-fill,minmax(10.5rem,1fr))] gap-x-3 gap-y-2">
        {variant && (
          <VariantSelect
            label={definition.fields[variant.name]?.label ?? variant.name}
            variant={variant}
            onFocus={() => setFocused(variant.name)}
            onChange={(value) => onChange(switchVariant(definition, params, value, rateSeed(input, params)))}
          />
        )}
        {visible.map((field) => (
          <FieldControl
            key={field.name}
            field={field}
            register={register}
            value={values[field.name]}
            error={fieldError(formState.errors, field.name)}
            issue={fieldIssue(field.name)}
            onFocus={() => setFocused(field.name)}
          />
        ))}
      </fieldset>
      {help && (
        <p className="mt-2 text-xs leading-4 text-muted" aria-live="polite">
          {help}
        </p>
      )}
    </form>
  );
}

function fieldError(errors: FieldErrors<FormValues>, name: string): string | undefined {
  const error = errors[name] as { message?: string } | undefined;
  return error?.message;
}

function VariantSelect({ label, variant, onChange, onFocus }: { label: string; variant: { name: string; options: string[]; value: string }; onChange(v: string): void; onFocus(): void }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="mb-0.5 block text-xs font-medium text-muted">
        {label}
      </label>
      <select id={id} name={variant.name} className={inputClass} value={variant.value} onFocus={onFocus} onChange={(e) => onChange(e.target.value)}>
        {variant.options.map((o) => (
          <option key={o} value={o}>
            {o}
          </option>
        ))}
      </select>
    </div>
  );
}

interface FieldControlProps {
  field: FieldSpec;
  register: UseFormRegister<FormValues>;
  value: unknown;
  error?: string;
  issue?: ChainIssue;
  onFocus(): void;
}

function FieldControl({ field, register, error, issue, onFocus }: FieldControlProps) {
  const id = useId();
  const messageId = id + '-message';
  const message = error ?? (issue ? messageInCell(issue).replace(new RegExp(`^${field.name}: `), '') : undefined);
  const tone = error || issue?.severity === 'error' ? 'text-danger' : 'text-amber-700 dark:text-amber-400';
  const registered = register(field.name);
  const described = message ? messageId : undefined;
  const labelRow = (
    <label htmlFor={id} className="mb-0.5 flex items-baseline justify-between gap-2 text-xs font-medium text-muted">
      <span className="truncate" title={field.help}>
        {field.label}
      </span>
      {field.unit && <span className="font-mono font-normal text-muted/80">{field.unit}</span>}
    </label>
  );
  const feedback = message && (
    <p id={messageId} className={`mt-0.5 text-xs leading-4 ${tone}`} data-field-error={field.name}>
      {message}
    </p>
  );
  switch (field.control) {
    case 'checkbox':
      return (
        <div className="flex flex-col justify-end">
          <label className="flex items-center gap-2 py-1 text-sm" title={field.help}>
            <input type="checkbox" {...registered} onFocus={onFocus} className="h-4 w-4 accent-[rgb(var(--q-accent))]" aria-describedby={described} />
            {field.label}
          </label>
          {feedback}
        </div>
      );
    case 'select':
      return (
        <div>
          {labelRow}
          <select id={id} {...registered} onFocus={onFocus} className={inputClass} aria-invalid={message ? true : undefined} aria-describedby={described}>
            {field.options.map((o) => (
              <option key={o} value={o}>
                {o}
              </option>
            ))}
          </select>
          {feedback}
        </div>
      );
    case 'choice-set':
      return (
        <fieldset className="col-span-full" aria-describedby={described}>
          <legend className="mb-0.5 text-xs font-medium text-muted">{field.label}</legend>
          <div className="flex flex-wrap gap-x-4 gap-y-1">
            {field.options.map((o) => (
              <label key={o} className="flex items-center gap-1.5 font-mono text-[13px]">
                <input type="checkbox" value={o} {...registered} onFocus={onFocus} className="h-3.5 w-3.5 accent-[rgb(var(--q-accent))]" />
                {o}
              </label>
            ))}
          </div>
          {feedback}
        </fieldset>
      );
    case 'number-list':
      return (
        <div className="col-span-full">
          {labelRow}
          <textarea
            id={id}
            {...registered}
            onFocus={onFocus}
            rows={3}
            spellCheck={false}
            className={inputClass + ' resize-y'}
            placeholder="Paste numbers separated by commas, spaces or new lines"
            aria-invalid={message ? true : undefined}
            aria-describedby={described}
          />
          {feedback}
        </div>
      );
    case 'number':
      return (
        <div>
          {labelRow}
          <input
              id={id}
              type="text"
              inputMode="decimal"
              autoComplete="off"
              spellCheck={false}
              {...registered}
              onFocus={onFocus}
              placeholder={field.optional ? 'not set' : undefined}
              className={inputClass}
              aria-invalid={error || issue?.severity === 'error' ? true : undefined}
              aria-describedby={described}
            />
          {feedback}
        </div>
      );
  }
}
