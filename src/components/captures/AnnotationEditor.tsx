import { useEffect, useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Field, FormMessage } from '../forms/Field';
import { buttonPrimary, buttonSecondary, input, label as labelClass } from '../ui';
import { formatQuantity } from '@/lib/units';
import {
  annotationFormSchema,
  formatSampleTime,
  parseSamples,
  type AnnotationContext,
  type AnnotationField,
  type AnnotationFormValues,
  type SigmfAnnotationObject,
} from './annotation-form';

/** What saving answered: done, or a problem for one field (or for the whole form when field is null). */
export type SaveOutcome = { ok: true } | { ok: false; field: AnnotationField | null; message: string };

export interface AnnotationEditorProps {
  /** True when the values edit an existing annotation, false for a new one. */
  existing: boolean;
  initialValues: AnnotationFormValues;
  capture: AnnotationContext & {
    /** RF frequency (Hz) of 0 Hz in the capture, or null when unknown. */
    centerFrequency: number | null;
  };
  onSave: (annotation: SigmfAnnotationObject) => Promise<SaveOutcome>;
  onCancel: () => void;
}

/** What a start or duration text stands for in the other unit: "= sample 50,000", "= 8,000 samples" or "= 12.5 ms". */
function samplesHint(text: string, sampleRate: number, kind: 'position' | 'length', fallback: string): string {
  if (!text.trim()) return fallback;
  const reading = parseSamples(text, sampleRate);
  if (!reading.ok) return fallback;
  if (!reading.fromTime) return `= ${formatSampleTime(reading.samples, sampleRate)}`;
  const samples = reading.samples.toLocaleString('en');
  return kind === 'position' ? `= sample ${samples}` : `= ${samples} samples`;
}

/**
 * The form of one SigMF annotation (label, start, duration, frequency edges, comment): checked by
 * zod beside each field, then handed to `onSave`, whose server problems land on their field.
 */
export function AnnotationEditor({ existing, initialValues, capture, onSave, onCancel }: AnnotationEditorProps) {
  const schema = useMemo(() => annotationFormSchema(capture), [capture]);
  const form = useForm<AnnotationFormValues, unknown, SigmfAnnotationObject>({
    resolver: zodResolver(schema),
    defaultValues: initialValues,
    reValidateMode: 'onChange',
  });
  const { register, handleSubmit, setError, formState, setFocus, control } = form;
  const [message, setMessage] = useState<string | null>(null);
  const [start, duration] = useWatch({ control, name: ['start', 'duration'] });
  // A new form (or a box just dragged on the spectrogram) is for typing a label first.
  useEffect(() => setFocus('label'), [setFocus]);

  const submit = handleSubmit(async (annotation) => {
    setMessage(null);
    const outcome = await onSave(annotation);
    if (outcome.ok) return;
    if (outcome.field) setError(outcome.field, { message: outcome.message }, { shouldFocus: true });
    else setMessage(outcome.message);
  });

  const errors = formState.errors;
  const edgesHint =
    capture.centerFrequency === null
      ? 'Centre frequency unknown: edges are read as offsets from 0 Hz. Both or neither.'
      : `RF frequency, SI prefixes allowed (centre ${formatQuantity(capture.centerFrequency, 'Hz', { significant: 10 })}). Both or neither.`;

  return (
    <form onSubmit={submit} noValidate aria-label={existing ? 'Edit annotation' : 'New annotation'} className="space-y-3 rounded-md border border-accent/40 bg-surface p-3" data-testid="annotation-form">
      <h4 className="text-sm font-semibold">{existing ? 'Edit annotation' : 'New annotation'}</h4>
      {message && <FormMessage tone="error">{message}</FormMessage>}
      <Field label="Label" {...register('label')} error={errors.label?.message} placeholder="e.g. beacon burst" maxLength={200} autoComplete="off" />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field
          label="Start"
          className={input + ' font-mono'}
          {...register('start')}
          error={errors.start?.message}
          placeholder="12.5 ms or 50000"
          hint={samplesHint(start, capture.sampleRate, 'position', 'A time or a sample number')}
          autoComplete="off"
        />
        <Field
          label="Duration"
          className={input + ' font-mono'}
          {...register('duration')}
          error={errors.duration?.message}
          placeholder="e.g. 2 ms"
          hint={samplesHint(duration, capture.sampleRate, 'length', 'Empty: no length')}
          autoComplete="off"
        />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Lower edge" className={input + ' font-mono'} {...register('lowerEdge')} error={errors.lowerEdge?.message} placeholder="e.g. 2.4121 GHz" autoComplete="off" />
        <Field label="Upper edge" className={input + ' font-mono'} {...register('upperEdge')} error={errors.upperEdge?.message} placeholder="e.g. 2.4131 GHz" autoComplete="off" />
      </div>
      <p className="-mt-1 text-xs text-muted">{edgesHint}</p>
      <div>
        <label htmlFor="annotation-comment" className={labelClass}>
          Comment
        </label>
        <textarea
          id="annotation-comment"
          rows={2}
          className={input}
          {...register('comment')}
          aria-invalid={errors.comment ? true : undefined}
          aria-describedby={errors.comment ? 'annotation-comment-error' : undefined}
        />
        {errors.comment && (
          <p id="annotation-comment-error" className="mt-1 text-sm text-danger" data-field-error="comment">
            {errors.comment.message}
          </p>
        )}
      </div>
      <div className="flex gap-2">
        <button type="submit" className={buttonPrimary} disabled={formState.isSubmitting}>
          {formState.isSubmitting ? 'Saving…' : 'Save annotation'}
        </button>
        <button type="button" className={buttonSecondary} onClick={onCancel} disabled={formState.isSubmitting}>
          Cancel
        </button>
      </div>
    </form>
  );
}
