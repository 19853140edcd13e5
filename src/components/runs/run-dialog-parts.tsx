/** What the two run dialogs share: the opening button, the search box, the revision document and the submission. */
import { useEffect, useState, type ReactNode } from 'react';
import { buttonSecondary, input } from '../ui';
import { chainsApi } from '../chains/api';
import { submitRuns } from './api';

/** A button that mounts `dialog` while open; the dialog gets the function that closes it. */
export function DialogButton({ text, testId, className, dialog }: { text: string; testId: string; className?: string; dialog: (onClose: () => void) => ReactNode }) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <button type="button" className={className ?? buttonSecondary} onClick={() => setOpen(true)} data-testid={testId}>
        {text}
      </button>
      {open && dialog(() => setOpen(false))}
    </>
  );
}

/** Waits `ms` (milliseconds) after the last change of `value`. */
export function useDebounced<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return settled;
}

/** The stored document of a chain revision, or null until it has loaded (or while nothing is chosen). */
export function useRevisionDocument(chainId: string | null, revision: number | null): unknown {
  const [document, setDocument] = useState<unknown>(null);
  useEffect(() => {
    setDocument(null);
    if (chainId === null || revision === null) return;
    let live = true;
    void chainsApi.revision(chainId, revision).then((result) => {
      if (live && result.ok) setDocument(result.data.document ?? null);
    });
    return () => {
      live = false;
    };
  }, [chainId, revision]);
  return document;
}

/**
 * Queues one run per capture and goes to the new run's page (or to the runs list when there are
 * several); a refusal stays in the dialog as `error`.
 */
export function useRunSubmission() {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function submit(chainId: string, revision: number, captureIds: string[]): Promise<void> {
    if (captureIds.length === 0) return;
    setBusy(true);
    setError(null);
    const result = await submitRuns(chainId, revision, captureIds);
    if (!result.ok) {
      setBusy(false);
      return setError(result.error.message);
    }
    const runs = result.data.runs;
    window.location.assign(runs.length === 1 ? `/runs/${runs[0].id}` : '/runs');
  }
  return { busy, error, submit };
}

interface SearchBoxProps {
  id: string;
  /** What is searched, plural: "chains", "captures". */
  noun: string;
  placeholder: string;
  value: string;
  onChange: (value: string) => void;
  /** Why the list could not be loaded. */
  listError: string | null;
}

/** The search field at the top of a picking dialog, with the list's loading error under it. */
export function SearchBox({ id, noun, placeholder, value, onChange, listError }: SearchBoxProps) {
  return (
    <>
      <label className="sr-only" htmlFor={id}>
        Search {noun}
      </label>
      <input id={id} className={input} type="search" placeholder={placeholder} value={value} onChange={(e) => onChange(e.target.value)} autoFocus />
      {listError && (
        <p role="alert" className="mt-3 text-sm text-danger">
          The {noun} could not be listed: {listError}
        </p>
      )}
    </>
  );
}
