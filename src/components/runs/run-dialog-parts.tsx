/** What the two run dialogs share: the opening button, the search box, the revision document and the submission. */
import { useEffect, useState, type ReactNode } from 'react';
import { buttonSecondary, input } from '../ui';
import type { StoredChainDocument } from '@/contracts/chain';
import { failureOf } from '../query/fetch';
import { useRevision } from '../chains/queries';
import { useSubmitRuns } from './hooks';

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

/**
 * The stored document of a chain revision (null until it has loaded, or while nothing is chosen),
 * and why it could not be read: a damaged document stops the run as the server would.
 */
export function useRevisionDocument(chainId: string | null, revision: number | null): { document: StoredChainDocument | null; failure: string | null } {
  const query = useRevision(chainId, revision);
  return { document: query.data?.document ?? null, failure: query.error ? query.error.message : null };
}

/**
 * Queues one run per capture and goes to the new run's page (or to the runs list when there are
 * several); a refusal stays in the dialog as `error`.
 */
export function useRunSubmission() {
  const mutation = useSubmitRuns();
  // Stays busy after success: the page is being left for the new run's.
  const [leaving, setLeaving] = useState(false);
  async function submit(chainId: string, revision: number, captureIds: string[]): Promise<void> {
    if (captureIds.length === 0) return;
    try {
      const { runs } = await mutation.mutateAsync({ chainId, revision, captureIds });
      setLeaving(true);
      window.location.assign(runs.length === 1 ? `/runs/${runs[0].id}` : '/runs');
    } catch {
      // The refusal is the mutation's error, shown in the dialog.
    }
  }
  const error = mutation.error ? failureOf(mutation.error).error.message : null;
  return { busy: mutation.isPending || leaving, error, submit };
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
