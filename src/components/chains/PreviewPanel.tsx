/**
 * Where the preview's samples come from: a capture picked from the list (its rate and sample type
 * become the chain's input), or, with no capture, an input format typed by hand so the rates and
 * warnings still show. Says plainly that the preview covers only the head of the capture.
 */
import { useState } from 'react';
import type { Capture } from '@/components/captures/types';
import type { SampleType, StreamFormat } from '@/dsp/types';
import { formatDuration, formatQuantity } from '@/lib/units';
import { PREVIEW_HEAD_SAMPLES } from './preview-protocol';
import type { PreviewState } from './use-preview';
import { parseFieldNumber } from './form-values';

interface PreviewPanelProps {
  captures: Capture[] | null;
  capturesError?: string;
  captureId: string | null;
  onCapture(id: string | null): void;
  manualInput: StreamFormat;
  onManualInput(format: StreamFormat): void;
  preview: PreviewState;
  /** Why the preview cannot run now (document errors), if it cannot. */
  blocked?: string;
}

const selectClass = 'block w-full rounded border border-line bg-surface px-2 py-1 text-sm';

export default function PreviewPanel({ captures, capturesError, captureId, onCapture, manualInput, onManualInput, preview, blocked }: PreviewPanelProps) {
  const capture = captures?.find((c) => c.id === captureId) ?? null;
  const headSamples = capture ? Math.min(PREVIEW_HEAD_SAMPLES, capture.sampleCount) : PREVIEW_HEAD_SAMPLES;
  return (
    <section className="rounded-lg border border-line bg-panel p-3" aria-labelledby="preview-title" data-testid="preview-panel">
      <h2 id="preview-title" className="mb-2 text-sm font-semibold">
        Preview
      </h2>
      <label htmlFor="preview-capture" className="mb-0.5 block text-xs font-medium text-muted">
        Capture
      </label>
      <select id="preview-capture" className={selectClass} value={captureId ?? ''} onChange={(e) => onCapture(e.target.value || null)} disabled={!captures}>
        <option value="">{captures ? 'None: type an input format' : 'Loading captures…'}</option>
        {captures?.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name} — {formatQuantity(c.sampleRate, 'Hz')}, {c.layout}
          </option>
        ))}
      </select>
      {capturesError && <p className="mt-1 text-xs text-danger">{capturesError}</p>}
      {capture ? (
        <>
          <p className="mt-2 rounded bg-accent/10 px-2 py-1.5 text-xs leading-4 text-ink" data-testid="preview-label">
            Preview of the first {headSamples.toLocaleString('en')} samples ({formatDuration(headSamples / capture.sampleRate)}) — not a full run.
          </p>
          <PreviewStatus preview={preview} blocked={blocked} />
        </>
      ) : (
        <ManualInput format={manualInput} onChange={onManualInput} />
      )}
    </section>
  );
}

function PreviewStatus({ preview, blocked }: { preview: PreviewState; blocked?: string }) {
  let text: string;
  let tone = 'text-muted';
  if (blocked) {
    text = blocked;
    tone = 'text-danger';
  } else if (preview.status === 'waiting' || preview.status === 'running') {
    text = preview.status === 'running' ? 'Running the chain on the head…' : 'Waiting for the edit to settle…';
  } else if (preview.status === 'error') {
    text = preview.error?.message ?? 'The preview failed.';
    tone = 'text-danger';
  } else if (preview.status === 'done') {
    const first = preview.afterEdit ? `Updated ${Math.round(preview.editToResultMs ?? 0)} ms after the edit` : `Ready in ${Math.round(preview.editToResultMs ?? 0)} ms`;
    const parts = [first, `run ${Math.round(preview.runMs ?? 0)} ms`];
    if ((preview.fetchMs ?? 0) > 5) parts.push(`fetch ${Math.round(preview.fetchMs!)} ms`);
    text = parts.join(' · ');
  } else {
    text = 'Mark a stage as a probe, or add a spectrum or measure stage, to see results here.';
  }
  return (
    <p
      className={`mt-2 text-xs ${tone}`}
      role="status"
      data-testid="preview-status"
      data-status={blocked ? 'blocked' : preview.status}
      data-results={preview.results}
      data-edit-to-result-ms={preview.editToResultMs !== undefined ? Math.round(preview.editToResultMs) : undefined}
    >
      {text}
    </p>
  );
}

function ManualInput({ format, onChange }: { format: StreamFormat; onChange(f: StreamFormat): void }) {
  const [rateText, setRateText] = useState(formatQuantity(format.sampleRate, 'Hz', { significant: 12 }));
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="mt-2 grid grid-cols-2 gap-2">
      <p className="col-span-2 text-xs text-muted">No capture: the rates and warnings follow this input. Pick a capture to preview results.</p>
      <div>
        <label htmlFor="manual-rate" className="mb-0.5 block text-xs font-medium text-muted">
          Sample rate
        </label>
        <input
          id="manual-rate"
          className="block w-full rounded border border-line bg-surface px-2 py-1 font-mono text-[13px] aria-[invalid=true]:border-danger"
          value={rateText}
          aria-invalid={error ? true : undefined}
          onChange={(e) => {
            setRateText(e.target.value);
            const read = parseFieldNumber(e.target.value, 'Hz');
            if (read.ok && read.value > 0) {
              setError(null);
              onChange({ ...format, sampleRate: read.value });
            } else setError(read.ok ? 'must be > 0 Hz' : read.message);
          }}
        />
        {error && <p className="mt-0.5 text-xs text-danger">{error}</p>}
      </div>
      <div>
        <label htmlFor="manual-type" className="mb-0.5 block text-xs font-medium text-muted">
          Sample type
        </label>
        <select id="manual-type" className={selectClass} value={format.sampleType} onChange={(e) => onChange({ ...format, sampleType: e.target.value as SampleType })}>
          <option value="complex">complex</option>
          <option value="real">real</option>
          <option value="real-pair">real-pair</option>
        </select>
      </div>
    </div>
  );
}
