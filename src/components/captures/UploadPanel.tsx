import { CENTRE_FREQUENCY_HELP } from './centre-frequency-help';
import { useEffect, useRef, useState } from 'react';
import { Field, FormMessage } from '../forms/Field';
import { buttonPrimary, buttonSecondary, input, label as labelClass } from '../ui';
import { announceCapturesChanged } from './api';
import { SIGMF_DATATYPES } from '@/dsp/formats/datatype';
import { formatBytes, formatQuantity, parseQuantity } from '@/lib/units';
import { LAYOUT_LABELS, type Capture } from './types';
import { PickError, readPickedFiles, type PickedUpload } from './upload-files';
import { checkUpload, formFieldOf, initialValues, type UploadErrors, type UploadValues } from './upload-form';
import { errorOfBody, finishedCapture, preCheck, sha256Of, uploadMetadata, HASH_LIMIT_BYTES } from './upload-steps';
import { startTransfer, type Transfer, type TransferProgress } from './upload-transfer';
import { UploadProgress } from './UploadProgress';

type Stage =
  | { kind: 'editing' }
  | { kind: 'checking'; what: string }
  | { kind: 'sending'; progress: TransferProgress }
  | { kind: 'finishing' }
  | { kind: 'done'; capture: Capture }
  | { kind: 'duplicate'; capture: Capture };

const KIND_LABELS: Record<PickedUpload['kind'], string> = {
  sigmf: 'SigMF recording: the description comes from its .sigmf-meta',
  wav: 'WAV file: datatype, rate and channels come from its header',
  raw: 'Raw samples: describe them below',
};

/**
 * Upload of a capture: pick a SigMF pair or archive, a WAV file or raw samples, describe what the
 * file does not, check before sending, then a resumable transfer with progress and cancel.
 */
export default function UploadPanel() {
  const [picked, setPicked] = useState<PickedUpload | null>(null);
  const [values, setValues] = useState<UploadValues>(() => initialValues(null));
  const [errors, setErrors] = useState<UploadErrors>({});
  // The tone travels with the text: a cancel the user asked for is news, not a failure.
  const [message, setMessage] = useState<{ text: string; tone: 'ok' | 'error' } | null>(null);
  const [stage, setStage] = useState<Stage>({ kind: 'editing' });
  const [ready, setReady] = useState(false);
  const transfer = useRef<Transfer | null>(null);
  const fileInput = useRef<HTMLInputElement>(null);
  useEffect(() => setReady(true), []);

  const busy = stage.kind === 'checking' || stage.kind === 'sending' || stage.kind === 'finishing';
  const fromFile = picked?.kind === 'sigmf' || picked?.kind === 'wav';

  async function pick(files: File[]) {
    setMessage(null);
    setStage({ kind: 'editing' });
    try {
      const next = await readPickedFiles(files);
      setPicked(next);
      setValues((v) => initialValues(next, v));
      setErrors({});
    } catch (error) {
      setPicked(null);
      setErrors({ file: error instanceof PickError ? error.message : `The file could not be read: ${(error as Error).message}` });
    }
  }

  const set = (key: keyof UploadValues) => (event: { target: { value: string } }) => setValues((v) => ({ ...v, [key]: event.target.value }));

  function refuse(field: string | null | undefined, text: string) {
    const formField = formFieldOf(field);
    if (formField) setErrors({ [formField]: text });
    else setMessage({ text, tone: 'error' });
    setStage({ kind: 'editing' });
  }

  async function submit(event: React.SyntheticEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const { description, errors: found } = checkUpload(values, picked);
    setErrors(found);
    if (!description || !picked) return;
    let sha256: string | null = null;
    if (picked.samplesBlob && picked.samplesBlob.size <= HASH_LIMIT_BYTES) {
      setStage({ kind: 'checking', what: 'Computing the sha256 to find an identical capture…' });
      sha256 = await sha256Of(picked.samplesBlob).catch(() => null);
    }
    setStage({ kind: 'checking', what: 'Checking the description and your quota…' });
    const check = await preCheck(description, picked, sha256);
    if (check.kind === 'duplicate') return setStage({ kind: 'duplicate', capture: check.capture });
    if (check.kind === 'refused') return refuse(check.error.field, check.error.message);

    setStage({ kind: 'sending', progress: { sent: 0, total: picked.body.size, bytesPerSecond: null, secondsLeft: null, retrying: false } });
    transfer.current = startTransfer(picked.body, picked.fileName, uploadMetadata(description, picked), {
      onProgress: (progress) => setStage((s) => (s.kind === 'sending' ? { kind: 'sending', progress } : s)),
      onDone: async (uploadId) => {
        transfer.current = null;
        setStage({ kind: 'finishing' });
        const finished = await finishedCapture(uploadId);
        if (finished.kind === 'refused') return refuse(finished.error.field, finished.error.message);
        setStage(finished.kind === 'created' ? { kind: 'done', capture: finished.capture } : { kind: 'duplicate', capture: finished.capture });
        if (finished.kind === 'created') announceCapturesChanged();
      },
      onFailed: (status, body, text) => {
        transfer.current = null;
        const error = errorOfBody(body);
        if (status === 409 && error?.capture) return setStage({ kind: 'duplicate', capture: error.capture });
        if (error) return refuse(error.field, error.message);
        refuse(null, status === 0 ? 'The connection to the server was lost and could not be re-established. Choose the same file again to resume where it stopped.' : `The upload failed: ${text}`);
      },
    });
  }

  async function cancel() {
    const running = transfer.current;
    transfer.current = null;
    setStage({ kind: 'editing' });
    await running?.cancel();
    setMessage({ text: 'Upload cancelled: nothing was stored.', tone: 'ok' });
  }

  function reset() {
    setPicked(null);
    setValues((v) => ({ ...initialValues(null, v), name: '' }));
    setErrors({});
    setMessage(null);
    setStage({ kind: 'editing' });
    if (fileInput.current) fileInput.current.value = '';
  }

  if (stage.kind === 'done' || stage.kind === 'duplicate') {
    return (
      <section aria-labelledby="upload-title" className="rounded-lg border border-line bg-panel p-5" data-testid="upload-panel">
        <h2 id="upload-title" className="text-lg font-semibold">
          Upload a capture
        </h2>
        <div role="status" className={'mt-3 rounded-md border px-3 py-3 text-sm ' + (stage.kind === 'done' ? 'border-ok/40 bg-ok/10' : 'border-accent/40 bg-accent/10')} data-testid={stage.kind === 'done' ? 'upload-done' : 'upload-duplicate'}>
          <p className="font-medium">{stage.kind === 'done' ? 'Capture stored.' : 'Identical capture already stored: nothing was uploaded twice.'}</p>
          <p className="mt-1">
            <a href={`/captures/${stage.capture.id}`} className="font-medium text-accent underline">
              {stage.capture.name}
            </a>
            <span className="text-muted">
              {' '}· {formatQuantity(stage.capture.sampleRate, 'sps')} · {formatBytes(stage.capture.byteSize)} · sha256 {stage.capture.sha256.slice(0, 12)}…
            </span>
          </p>
        </div>
        <button type="button" className={buttonSecondary + ' mt-4'} onClick={reset}>
          Upload another
        </button>
      </section>
    );
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="upload-title" className="@container rounded-lg border border-line bg-panel p-5" data-testid="upload-panel" data-ready={ready || undefined}>
      <h2 id="upload-title" className="text-lg font-semibold">
        Upload a capture
      </h2>
      <p className="mt-1 text-sm text-muted">A .sigmf-meta with its .sigmf-data, a .sigmf archive, a WAV file, or raw samples. Large files resume after a dropped connection.</p>

      {/* Two columns in the narrow sidebar, six when the panel spans the page: a container query, not the viewport. */}
      <div className="mt-4 grid grid-cols-2 gap-4 @3xl:grid-cols-6">
        <div className="col-span-2 @3xl:col-span-6">
          <FilePicker inputRef={fileInput} picked={picked} error={errors.file} disabled={busy} onPick={pick} />
          {picked?.note && <p className="mt-1 text-xs text-muted">{picked.note}</p>}
        </div>

        <div className="col-span-2 @3xl:col-span-4">
          <Field label="Name" name="name" value={values.name} onChange={set('name')} error={errors.name} disabled={busy} maxLength={200} />
        </div>
        <div className="col-span-2">
          <Select label="Visibility" value={values.visibility} onChange={set('visibility')} error={errors.visibility} disabled={busy}>
            <option value="team">Team: every signed-in user reads it</option>
            <option value="private">Private: only you</option>
          </Select>
        </div>

        {fromFile ? (
          <div className="col-span-2 @3xl:col-span-4">
            <FileFacts picked={picked!} layout={values.layout} />
          </div>
        ) : (
          <>
            <Select label="Datatype" value={values.datatype} onChange={set('datatype')} error={errors.datatype} disabled={busy} mono>
              {SIGMF_DATATYPES.map((d) => (
                <option key={d}>{d}</option>
              ))}
            </Select>
            <Select label="Channel layout" value={values.layout} onChange={set('layout')} error={errors.layout} disabled={busy}>
              {Object.entries(LAYOUT_LABELS).map(([value, text]) => (
                <option key={value} value={value}>
                  {text}
                </option>
              ))}
            </Select>
          </>
        )}
        {picked?.kind === 'wav' && picked.stated.layout === 'real-pair' && (
          <div className="col-span-2">
            <Select label="Two channels are" value={values.layout} onChange={set('layout')} error={errors.layout} disabled={busy}>
              <option value="real-pair">Two real channels (stored as they are)</option>
              <option value="complex">I (left) and Q (right): store as complex</option>
            </Select>
          </div>
        )}
        {(!fromFile || picked?.stated.sampleRate === undefined) && (
          <div className="col-span-2">
            <SiField label="Sample rate" unit="Hz" aliases={['sps', 'S/s']} placeholder="e.g. 4M or 4 MHz" value={values.sampleRate} onChange={set('sampleRate')} error={errors.sampleRate} disabled={busy} />
          </div>
        )}
        {picked?.kind !== 'sigmf' && (
          <div className="col-span-2">
            <SiField label="Centre frequency (optional)" unit="Hz" note={CENTRE_FREQUENCY_HELP} placeholder="e.g. 2.412 GHz" value={values.centerFrequency} onChange={set('centerFrequency')} error={errors.centerFrequency} disabled={busy} />
          </div>
        )}
        <div className="col-span-2">
          <Field label="Tags" name="tags" value={values.tags} onChange={set('tags')} error={errors.tags} hint="Comma separated" disabled={busy} />
        </div>
        <div className="col-span-2 @3xl:col-span-4">
          <label className={labelClass} htmlFor="upload-notes">
            Notes
          </label>
          <textarea id="upload-notes" rows={2} className={input} value={values.notes} onChange={set('notes')} disabled={busy} />
        </div>
      </div>

      {message && <div className="mt-4"><FormMessage tone={message.tone}>{message.text}</FormMessage></div>}

      {stage.kind === 'sending' ? (
        <UploadProgress progress={stage.progress} onCancel={cancel} />
      ) : (
        <div className="mt-5 flex items-center gap-3">
          <button type="submit" className={buttonPrimary} disabled={busy || !ready}>
            {stage.kind === 'checking' ? 'Checking…' : stage.kind === 'finishing' ? 'Storing…' : 'Upload'}
          </button>
          {(stage.kind === 'checking' || stage.kind === 'finishing') && (
            <span role="status" className="text-sm text-muted">
              {stage.kind === 'checking' ? stage.what : 'All bytes sent; the server is storing the capture…'}
            </span>
          )}
        </div>
      )}
    </form>
  );
}

function FilePicker({ inputRef, picked, error, disabled, onPick }: { inputRef: React.RefObject<HTMLInputElement | null>; picked: PickedUpload | null; error?: string; disabled: boolean; onPick: (files: File[]) => void }) {
  const [over, setOver] = useState(false);
  return (
    <div>
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => {
          e.preventDefault();
          setOver(false);
          if (!disabled) onPick(Array.from(e.dataTransfer.files));
        }}
        className={'rounded-md border border-dashed px-4 py-4 text-sm ' + (error ? 'border-danger' : over ? 'border-accent bg-accent/5' : 'border-muted/50')}
      >
        <label className="flex flex-wrap items-center gap-3">
          <span className={buttonSecondary + (disabled ? ' opacity-60' : ' cursor-pointer')}>Choose files…</span>
          <span className="text-muted">or drop them here</span>
          <input
            ref={inputRef}
            type="file"
            multiple
            className="sr-only"
            name="file"
            disabled={disabled}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? 'upload-file-error' : undefined}
            onChange={(e) => onPick(Array.from(e.target.files ?? []))}
          />
        </label>
        {picked && (
          <div className="mt-3 text-sm" data-testid="picked-file">
            <div className="break-all font-medium">{picked.fileName}</div>
            <div className="text-xs text-muted">
              <span className="font-mono">{formatBytes(picked.body.size)}</span> · {KIND_LABELS[picked.kind]}
            </div>
          </div>
        )}
      </div>
      {error && (
        <p id="upload-file-error" className="mt-1 text-sm text-danger" data-field-error="file">
          {error}
        </p>
      )}
    </div>
  );
}

function FileFacts({ picked, layout }: { picked: PickedUpload; layout: UploadValues['layout'] }) {
  const s = picked.stated;
  const facts: [string, string][] = [
    ['Datatype', s.datatype ?? 'set by the server'],
    ['Layout', LAYOUT_LABELS[layout]],
    ['Sample rate', s.sampleRate !== undefined ? formatQuantity(s.sampleRate, 'sps', { significant: 8 }) : 'missing'],
  ];
  if (picked.kind === 'sigmf') facts.push(['Centre frequency', s.centerFrequency != null ? formatQuantity(s.centerFrequency, 'Hz', { significant: 10 }) : 'not given']);
  return (
    <dl className="grid grid-cols-[8rem_minmax(0,1fr)] gap-x-3 gap-y-1 rounded-md bg-surface px-3 py-2 text-sm">
      {facts.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-muted">{k}</dt>
          <dd className="font-mono">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function Select({ label, error, mono, children, ...props }: { label: string; error?: string; mono?: boolean; children: React.ReactNode; value: string; onChange: (e: { target: { value: string } }) => void; disabled?: boolean }) {
  const id = `upload-${label.toLowerCase().replace(/\W+/g, '-')}`;
  return (
    <div>
      <label htmlFor={id} className={labelClass}>
        {label}
      </label>
      <select id={id} className={input + (mono ? ' font-mono' : '')} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} {...props}>
        {children}
      </select>
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm text-danger" data-field-error={id}>
          {error}
        </p>
      )}
    </div>
  );
}

/** A text field taking SI prefixes, showing how the text was read ("= 4 MHz") as its hint. */
function SiField({ label, unit, aliases, note, value, error, ...props }: { label: string; unit: string; aliases?: string[]; note?: string; placeholder: string; value: string; error?: string; onChange: (e: { target: { value: string } }) => void; disabled?: boolean }) {
  const parsed = value.trim() ? parseQuantity(value, unit, { aliases }) : null;
  const read = parsed?.ok ? `= ${formatQuantity(parsed.value, unit, { significant: 10 })}` : 'SI prefixes allowed: k, M, G';
  const hint = note ? `${read}. ${note}.` : read;
  return <Field label={label} value={value} error={error} hint={hint} className={input + ' font-mono'} {...props} />;
}
