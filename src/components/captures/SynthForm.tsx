import { requestJson } from '@/components/query/fetch';
import { useEffect, useMemo, useState } from 'react';
import { FormProvider, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { demoSynthSpecs } from '@/dsp/synth/demo';
import { synthSampleCount } from '@/dsp/synth/spec';
import { synthSpecWarnings, type SynthSpec } from '@/dsp/synth/validate';
import { formatBytes, formatQuantity } from '@/lib/units';
import { buttonPrimary, input, label as labelClass } from '../ui';
import { FieldView } from './SynthFieldViews';
import { formNameOf, formValuesOf, synthFormModel, synthFormSchema, type SynthFormValues } from './synth-form-schema';
import { bytesPerSample } from './upload-files';
import type { Capture } from './types';

const DEFAULT_PRESET = 'default';
const defaultSpec = { name: 'Synthesized capture' };

function presetSpec(slug: string) {
  return demoSynthSpecs.find((d) => d.slug === slug)?.spec ?? defaultSpec;
}

/**
 * The synthesizer form, generated from the engine's spec schema: numbers take SI prefixes, the
 * spec's own checks run as the resolver, and the capture is made by POST /api/synth.
 */
export default function SynthForm() {
  const [preset, setPreset] = useState(DEFAULT_PRESET);
  const [visibility, setVisibility] = useState<'team' | 'private'>('team');
  const [tags, setTags] = useState('synthesized');
  const [notes, setNotes] = useState('');
  const [message, setMessage] = useState<React.ReactNode>(null);
  const [duplicate, setDuplicate] = useState(false);
  const [busy, setBusy] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  const form = useForm<SynthFormValues, unknown, SynthSpec>({
    defaultValues: formValuesOf(defaultSpec),
    resolver: zodResolver(synthFormSchema as never) as never,
    mode: 'onChange',
  });
  const values = useWatch({ control: form.control });

  // A layout the datatype cannot hold (c types are complex): flip r and c so the pair agrees.
  const layout = values.layout as string | undefined;
  useEffect(() => {
    const datatype = String(form.getValues('datatype') ?? '');
    const wantsComplex = layout === 'complex';
    if (wantsComplex && datatype.startsWith('r')) form.setValue('datatype', 'c' + datatype.slice(1), { shouldValidate: true });
    if (!wantsComplex && datatype.startsWith('c')) form.setValue('datatype', 'r' + datatype.slice(1), { shouldValidate: true });
  }, [layout, form]);

  const summary = useMemo(() => {
    const parsed = synthFormSchema.safeParse(values);
    if (!parsed.success) return null;
    const spec = parsed.data;
    const samples = synthSampleCount(spec);
    const bytes = samples * (bytesPerSample(spec.datatype, spec.layout) ?? 0);
    return { spec, samples, bytes, warnings: synthSpecWarnings(spec) };
  }, [values]);

  function choosePreset(slug: string) {
    setPreset(slug);
    const demo = demoSynthSpecs.find((d) => d.slug === slug);
    form.reset(formValuesOf(presetSpec(slug)));
    setTags(demo ? demo.tags.join(', ') : 'synthesized');
    setNotes(demo?.description ?? '');
    setMessage(null);
  }

  async function submit(spec: SynthSpec) {
    setMessage(null);
    setDuplicate(false);
    setBusy(true);
    const outcome = await postSynth({
      name: spec.name?.trim() || 'Synthesized capture',
      visibility,
      notes,
      tags: tags.split(',').map((t) => t.trim()).filter(Boolean),
      spec,
    });
    if (outcome.kind === 'created') {
      window.location.assign(`/captures/${outcome.capture.id}`);
      return;
    }
    setBusy(false);
    if (outcome.kind === 'duplicate') {
      setDuplicate(true);
      setMessage(
        <span data-testid="synth-duplicate">
          Identical capture already stored (the same spec and seed give the same bytes):{' '}
          <a className="font-medium underline" href={`/captures/${outcome.capture.id}`}>
            {outcome.capture.name}
          </a>
        </span>,
      );
      return;
    }
    const field = outcome.field ? formNameOf(outcome.field) : null;
    if (field && field !== 'name' && form.getValues(field as never) !== undefined) form.setError(field as never, { message: outcome.message });
    else setMessage(outcome.message);
  }

  const simple = synthFormModel.filter((f) => f.kind !== 'group' && f.kind !== 'list' && f.kind !== 'variants');
  const sections = synthFormModel.filter((f) => f.kind === 'group' || f.kind === 'list' || f.kind === 'variants');

  return (
    <FormProvider {...form}>
      <form onSubmit={form.handleSubmit(submit)} noValidate aria-label="Synthesize a capture" data-testid="synth-form" data-ready={ready || undefined} className="grid items-start gap-6 xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0 space-y-4">
          <section className="rounded-lg border border-line bg-panel p-5" aria-labelledby="synth-capture">
            <div className="mb-4 flex flex-wrap items-end justify-between gap-3">
              <h2 id="synth-capture" className="text-lg font-semibold">
                Capture
              </h2>
              <label className="text-sm">
                <span className="mr-2 text-muted">Start from</span>
                <select className="rounded-md border border-muted/40 bg-surface px-2 py-1.5 text-sm" value={preset} onChange={(e) => choosePreset(e.target.value)} aria-label="Start from a preset">
                  <option value={DEFAULT_PRESET}>One tone over noise (defaults)</option>
                  {demoSynthSpecs.map((d) => (
                    <option key={d.slug} value={d.slug}>
                      {d.name}
                    </option>
                  ))}
                </select>
              </label>
            </div>
            <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3 min-[1920px]:grid-cols-4">
              {simple.map((f) => (
                <FieldView key={f.key} field={f} name={f.key} />
              ))}
            </div>
          </section>
          {sections.map((f) => (
            <section key={f.key} className="rounded-lg border border-line bg-panel p-5" aria-labelledby={`synth-${f.key}`}>
              <h2 id={`synth-${f.key}`} className="mb-3 text-lg font-semibold">
                {f.label}
              </h2>
              <FieldView field={f} name={f.key} />
            </section>
          ))}
        </div>

        <aside className="space-y-4 xl:sticky xl:top-20">
          <section className="rounded-lg border border-line bg-panel p-5" aria-labelledby="synth-store">
            <h2 id="synth-store" className="mb-3 text-lg font-semibold">
              Store as
            </h2>
            <div className="space-y-3">
              <div>
                <label htmlFor="synth-visibility" className={labelClass}>
                  Visibility
                </label>
                <select id="synth-visibility" className={input} value={visibility} onChange={(e) => setVisibility(e.target.value as 'team' | 'private')}>
                  <option value="team">Team: every signed-in user reads it</option>
                  <option value="private">Private: only you</option>
                </select>
              </div>
              <div>
                <label htmlFor="synth-tags" className={labelClass}>
                  Tags
                </label>
                <input id="synth-tags" className={input} value={tags} onChange={(e) => setTags(e.target.value)} />
                <p className="mt-1 text-xs text-muted">Comma separated</p>
              </div>
              <div>
                <label htmlFor="synth-notes" className={labelClass}>
                  Notes
                </label>
                <textarea id="synth-notes" rows={3} className={input} value={notes} onChange={(e) => setNotes(e.target.value)} />
              </div>
            </div>
            <Summary summary={summary} />
            {message && (
              <div className="mt-4">
                <p role="alert" className={'rounded-md border px-3 py-2 text-sm ' + (duplicate ? 'border-accent/40 bg-accent/10 text-ink' : 'border-danger/40 bg-danger/10 text-danger')}>
                  {message}
                </p>
              </div>
            )}
            <button type="submit" className={buttonPrimary + ' mt-4 w-full'} disabled={busy || !ready}>
              {busy ? 'Synthesizing…' : 'Synthesize and store'}
            </button>
          </section>
        </aside>
      </form>
    </FormProvider>
  );
}

function Summary({ summary }: { summary: { spec: SynthSpec; samples: number; bytes: number; warnings: { message: string }[] } | null }) {
  if (!summary) return <p className="mt-4 text-sm text-muted">Fix the fields marked in red to see the size of the capture.</p>;
  const { spec, samples, bytes, warnings } = summary;
  return (
    <div className="mt-4 space-y-2 border-t border-line pt-3 text-sm" data-testid="synth-summary">
      <p>
        <span className="font-mono tabular-nums">{samples.toLocaleString('en')}</span> samples ({formatQuantity(spec.duration, 's')} at{' '}
        {formatQuantity(spec.sampleRate, 'sps')}), <span className="font-mono">{formatBytes(bytes)}</span> as <span className="font-mono">{spec.datatype}</span>.
      </p>
      {warnings.map((w, i) => (
        <p key={i} className="rounded-md border border-amber-500/40 bg-amber-500/10 px-2 py-1 text-xs">
          {w.message}
        </p>
      ))}
    </div>
  );
}

type SynthOutcome = { kind: 'created'; capture: Capture } | { kind: 'duplicate'; capture: Capture } | { kind: 'refused'; message: string; field?: string | null };

/** POST /api/synth; a 409 carries the identical capture already stored beside the error. */
async function postSynth(body: unknown): Promise<SynthOutcome> {
  const result = await requestJson<Capture>('POST', '/api/synth', body);
  if (result.ok) return { kind: 'created', capture: result.data };
  const duplicate = (result.body as { capture?: Capture; error?: { capture?: Capture } } | undefined);
  const existing = duplicate?.capture ?? duplicate?.error?.capture;
  if (result.status === 409 && existing) return { kind: 'duplicate', capture: existing };
  return { kind: 'refused', message: result.error.message, field: result.error.field };
}
