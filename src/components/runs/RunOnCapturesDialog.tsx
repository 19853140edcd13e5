import { useEffect, useMemo, useState } from 'react';
import { Quantity } from '../Quantity';
import { buttonSecondary, input } from '../ui';
import { fetchCaptureList } from '../captures/api';
import { LAYOUT_LABELS, type Capture } from '../captures/types';
import { chainsApi } from '../chains/api';
import { submitRuns } from './api';
import { DialogShell } from '../DialogShell';
import { runBlocker } from './run-check';

export interface RunOnCapturesProps {
  chainId: string;
  chainName: string;
  /** The saved revision to run. */
  revision: number;
  /** Unsaved edits in the editor are not part of the run: say so. */
  unsavedEdits?: boolean;
  /** Classes of the opening button (defaults to a secondary button). */
  className?: string;
}

/** "Run on captures…": opens a dialog to rerun this chain revision on one or several captures. */
export function RunOnCapturesButton(props: RunOnCapturesProps) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <button type="button" className={props.className ?? buttonSecondary} onClick={() => setOpen(true)} data-testid="run-on-captures">
        Run on captures…
      </button>
      {open && <RunOnCapturesDialog {...props} onClose={() => setOpen(false)} />}
    </>
  );
}

/** Waits `ms` after the last change of `value`. */
function useDebounced<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return settled;
}

const LIST_SIZE = 100;

function RunOnCapturesDialog({ chainId, chainName, revision, unsavedEdits, onClose }: RunOnCapturesProps & { onClose: () => void }) {
  const [search, setSearch] = useState('');
  const q = useDebounced(search.trim(), 250);
  const [captures, setCaptures] = useState<Capture[] | null>(null);
  const [total, setTotal] = useState(0);
  const [listError, setListError] = useState<string | null>(null);
  const [document, setDocument] = useState<unknown>(null);
  const [selected, setSelected] = useState<Map<string, Capture>>(new Map());
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let live = true;
    void chainsApi.revision(chainId, revision).then((result) => {
      if (live && result.ok) setDocument(result.data.document ?? null);
    });
    return () => {
      live = false;
    };
  }, [chainId, revision]);

  useEffect(() => {
    let live = true;
    fetchCaptureList({ q: q || undefined, sort: 'createdAt', order: 'desc', page: 1, pageSize: LIST_SIZE })
      .then((list) => {
        if (!live) return;
        setCaptures(list.items);
        setTotal(list.total);
        setListError(null);
      })
      .catch((e: Error) => live && setListError(e.message));
    return () => {
      live = false;
    };
  }, [q]);

  // Why each listed capture cannot take this chain (the check the server makes), once the revision is loaded.
  const blockers = useMemo(() => {
    const out = new Map<string, string>();
    if (document === null || !captures) return out;
    for (const capture of captures) {
      const blocker = runBlocker(document, capture);
      if (blocker) out.set(capture.id, blocker);
    }
    return out;
  }, [document, captures]);

  function toggle(capture: Capture) {
    setSelected((current) => {
      const next = new Map(current);
      if (next.has(capture.id)) next.delete(capture.id);
      else next.set(capture.id, capture);
      return next;
    });
  }

  async function submit() {
    const ids = [...selected.keys()];
    if (ids.length === 0) return;
    setBusy(true);
    setError(null);
    const result = await submitRuns(chainId, revision, ids);
    if (!result.ok) {
      setBusy(false);
      return setError(result.error.message);
    }
    window.location.assign(result.data.runs.length === 1 ? `/runs/${result.data.runs[0].id}` : '/runs');
  }

  const count = selected.size;
  return (
    <DialogShell
      title="Run on captures"
      subtitle={
        <>
          <span className="font-medium text-ink">{chainName}</span> <span className="font-mono">r{revision}</span>, one run per capture, on the server.
          {unsavedEdits && <span className="block text-xs">Unsaved edits are not part of the run: it uses revision {revision} as saved.</span>}
        </>
      }
      confirmLabel={count <= 1 ? 'Run' : `Run on ${count} captures`}
      confirmDisabled={count === 0}
      busy={busy}
      error={error}
      confirmTestId="run-dialog-submit"
      onConfirm={() => void submit()}
      onClose={onClose}
    >
      <label className="sr-only" htmlFor="run-capture-search">
        Search captures
      </label>
      <input
        id="run-capture-search"
        className={input}
        type="search"
        placeholder="Search captures by name, notes or tag"
        value={search}
        onChange={(e) => setSearch(e.target.value)}
        autoFocus
      />
      {listError && (
        <p role="alert" className="mt-3 text-sm text-danger">
          The captures could not be listed: {listError}
        </p>
      )}
      <ul className="mt-3 divide-y divide-line rounded-md border border-line" aria-label="Captures">
        {captures === null && !listError && <li className="px-3 py-4 text-sm text-muted">Loading the captures…</li>}
        {captures?.length === 0 && (
          <li className="px-3 py-4 text-sm text-muted">{q ? 'No capture matches.' : 'No captures yet: upload or synthesize one first.'}</li>
        )}
        {captures?.map((capture) => {
          const blocker = blockers.get(capture.id);
          return (
            <li key={capture.id}>
              <label className={'flex items-start gap-3 px-3 py-2 ' + (blocker ? 'cursor-not-allowed opacity-70' : 'cursor-pointer hover:bg-surface')}>
                <input
                  type="checkbox"
                  className="mt-1 h-4 w-4 accent-[rgb(var(--q-accent))]"
                  checked={selected.has(capture.id)}
                  disabled={Boolean(blocker) && !selected.has(capture.id)}
                  onChange={() => toggle(capture)}
                />
                <span className="min-w-0 flex-1">
                  <span className="block truncate text-sm font-medium">{capture.name}</span>
                  <span className="flex flex-wrap gap-x-3 text-xs text-muted">
                    <span>{LAYOUT_LABELS[capture.layout]}</span>
                    <Quantity value={capture.sampleRate} unit="sps" />
                    <Quantity value={capture.durationSeconds} unit="s" />
                    <span>{capture.owner.name}</span>
                  </span>
                  {blocker && <span className="mt-0.5 block text-xs text-danger">Cannot run: {blocker}</span>}
                </span>
              </label>
            </li>
          );
        })}
      </ul>
      {captures && total > captures.length && (
        <p className="mt-2 text-xs text-muted">
          Showing the newest {captures.length} of {total}; search to find others.
        </p>
      )}
      {count > 0 && (
        <p className="mt-3 text-sm text-muted" aria-live="polite">
          {count} selected: {[...selected.values()].map((c) => c.name).join('; ')}
        </p>
      )}
    </DialogShell>
  );
}
