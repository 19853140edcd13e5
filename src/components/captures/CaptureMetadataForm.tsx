import { CENTRE_FREQUENCY_HELP } from './centre-frequency-help';
import { useEffect, useState } from 'react';
import { Field, FormMessage } from '../forms/Field';
import { buttonPrimary, input, label as labelClass } from '../ui';
import { formatQuantity, parseQuantity } from '@/lib/units';
import { failureOf } from '@/components/query/fetch';
import { withQueryClient } from '../table/withQueryClient';
import { useUpdateCapture } from './queries';
import type { Capture } from './types';


type Editable = Pick<Capture, 'id' | 'name' | 'notes' | 'tags' | 'visibility' | 'centerFrequency' | 'owner' | 'permissions'>;
type FieldName = 'name' | 'notes' | 'tags' | 'visibility' | 'centerFrequency';

export interface CaptureMetadataFormProps {
  capture: Editable;
}

function valuesOf(capture: Editable) {
  return {
    name: capture.name,
    notes: capture.notes,
    tags: capture.tags.join(', '),
    visibility: capture.visibility,
    centerFrequency: capture.centerFrequency === null ? '' : formatQuantity(capture.centerFrequency, 'Hz', { significant: 12 }),
  };
}

/**
 * The description of a capture (name, notes, tags, visibility, centre frequency): a form for the
 * owner or an admin, saved with PATCH; read-only for everyone else, saying who may change it.
 */
function CaptureMetadataForm({ capture }: CaptureMetadataFormProps) {
  const update = useUpdateCapture();
  const [values, setValues] = useState(() => valuesOf(capture));
  const [saved, setSaved] = useState(() => valuesOf(capture));
  const [errors, setErrors] = useState<Partial<Record<FieldName, string>>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);

  if (!capture.permissions.update) return <ReadOnly capture={capture} />;

  const set = (key: FieldName) => (event: { target: { value: string } }) => setValues((v) => ({ ...v, [key]: event.target.value }));
  const dirty = JSON.stringify(values) !== JSON.stringify(saved);
  const centre = values.centerFrequency.trim() ? parseQuantity(values.centerFrequency, 'Hz') : null;

  async function submit(event: React.SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const found: Partial<Record<FieldName, string>> = {};
    if (!values.name.trim()) found.name = 'Give the capture a name.';
    if (centre && !centre.ok) found.centerFrequency = `Centre frequency ${centre.message}.`;
    setErrors(found);
    if (Object.keys(found).length > 0) return;
    setBusy(true);
    const changes = {
      name: values.name.trim(),
      notes: values.notes,
      tags: values.tags.split(',').map((t) => t.trim()).filter(Boolean),
      visibility: values.visibility,
      centerFrequency: centre && centre.ok ? centre.value : null,
    };
    const result = await update.mutateAsync({ id: capture.id, changes }).then((data) => ({ ok: true as const, data }), failureOf);
    setBusy(false);
    if (!result.ok) {
      const field = result.error.field as FieldName | undefined;
      if (field && ['name', 'notes', 'tags', 'visibility', 'centerFrequency'].includes(field)) setErrors({ [field]: result.error.message });
      else setMessage({ tone: 'error', text: result.error.message });
      return;
    }
    // The page's header, facts and quick-look axes were drawn from the old values: show the new ones.
    const frequencyChanged = result.data.centerFrequency !== capture.centerFrequency;
    if (frequencyChanged || result.data.name !== capture.name) {
      window.location.reload();
      return;
    }
    const next = valuesOf(result.data);
    setValues(next);
    setSaved(next);
    setMessage({ tone: 'ok', text: 'Saved.' });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Capture description" className="space-y-4" data-testid="metadata-form" data-ready={ready || undefined}>
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      <Field label="Name" name="name" value={values.name} onChange={set('name')} error={errors.name} maxLength={200} />
      <Field
        label="Centre frequency"
        name="centerFrequency"
        className={input + ' font-mono'}
        value={values.centerFrequency}
        onChange={set('centerFrequency')}
        error={errors.centerFrequency}
        placeholder="unknown; e.g. 2.412 GHz"
        hint={`${centre?.ok ? `= ${formatQuantity(centre.value, 'Hz', { significant: 10 })}: ` : ''}${CENTRE_FREQUENCY_HELP}${centre?.ok ? '.' : '; SI prefixes allowed. Empty = unknown.'}`}
      />
      <div className="grid gap-4 sm:grid-cols-2">
        <div>
          <label htmlFor="meta-visibility" className={labelClass}>
            Visibility
          </label>
          <select id="meta-visibility" className={input} value={values.visibility} onChange={set('visibility')} aria-invalid={errors.visibility ? true : undefined}>
            <option value="team">Team: every signed-in user reads it</option>
            <option value="private">Private: only you</option>
          </select>
          {errors.visibility && <p className="mt-1 text-sm text-danger">{errors.visibility}</p>}
        </div>
        <Field label="Tags" name="tags" value={values.tags} onChange={set('tags')} error={errors.tags} hint="Comma separated" />
      </div>
      <div>
        <label htmlFor="meta-notes" className={labelClass}>
          Notes
        </label>
        <textarea id="meta-notes" rows={4} className={input} value={values.notes} onChange={set('notes')} aria-invalid={errors.notes ? true : undefined} />
        {errors.notes && <p className="mt-1 text-sm text-danger">{errors.notes}</p>}
      </div>
      <button type="submit" className={buttonPrimary} disabled={busy || !ready || !dirty}>
        {busy ? 'Saving…' : 'Save changes'}
      </button>
    </form>
  );
}

function ReadOnly({ capture }: { capture: Editable }) {
  return (
    <div data-testid="metadata-readonly">
      <dl className="grid grid-cols-[9rem_minmax(0,1fr)] gap-x-4 gap-y-2 text-sm">
        <dt className="text-muted">Name</dt>
        <dd>{capture.name}</dd>
        <dt className="text-muted">Centre frequency</dt>
        <dd className="font-mono">{capture.centerFrequency === null ? 'unknown' : formatQuantity(capture.centerFrequency, 'Hz', { significant: 10 })}</dd>
        <dt className="text-muted">Visibility</dt>
        <dd>{capture.visibility === 'team' ? 'Team' : 'Private'}</dd>
        <dt className="text-muted">Tags</dt>
        <dd>{capture.tags.length ? capture.tags.join(', ') : <span className="text-muted">none</span>}</dd>
        <dt className="text-muted">Notes</dt>
        <dd className="whitespace-pre-wrap">{capture.notes || <span className="text-muted">none</span>}</dd>
      </dl>
      <p className="mt-4 border-t border-line pt-3 text-xs text-muted">
        Read only: only the owner ({capture.owner.name}) or an admin may change this description.
      </p>
    </div>
  );
}

export default withQueryClient(CaptureMetadataForm, 0);
