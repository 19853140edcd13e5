import { useMemo, useState } from 'react';
import { Quantity } from '../Quantity';
import { useCaptureList } from '../captures/queries';
import { LAYOUT_LABELS, type Capture } from '../captures/types';
import { DialogShell } from '../DialogShell';
import { DialogButton, SearchBox, useDebounced, useRevisionDocument, useRunSubmission } from './run-dialog-parts';
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
  return (
    <DialogButton text="Run on captures…" testId="run-on-captures" className={props.className} dialog={(onClose) => <RunOnCapturesDialog {...props} onClose={onClose} />} />
  );
}

const LIST_SIZE = 100;

function RunOnCapturesDialog({ chainId, chainName, revision, unsavedEdits, onClose }: RunOnCapturesProps & { onClose: () => void }) {
  const [search, setSearch] = useState('');
  const q = useDebounced(search.trim(), 250);
  const list = useCaptureList({ q: q || undefined, sort: 'createdAt', order: 'desc', page: 1, pageSize: LIST_SIZE });
  const captures = list.data?.items ?? null;
  const total = list.data?.total ?? 0;
  const listError = list.error ? list.error.message : null;
  const { document, failure } = useRevisionDocument(chainId, revision);
  const [selected, setSelected] = useState<Map<string, Capture>>(new Map());
  const { busy, error, submit } = useRunSubmission();

  // Why each listed capture cannot take this chain (the check the server makes), once the revision is loaded.
  const blockers = useMemo(() => {
    const out = new Map<string, string>();
    if (!captures || (document === null && failure === null)) return out;
    for (const capture of captures) {
      const blocker = failure ?? runBlocker(document!, capture);
      if (blocker) out.set(capture.id, blocker);
    }
    return out;
  }, [document, failure, captures]);

  function toggle(capture: Capture) {
    setSelected((current) => {
      const next = new Map(current);
      if (next.has(capture.id)) next.delete(capture.id);
      else next.set(capture.id, capture);
      return next;
    });
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
      onConfirm={() => void submit(chainId, revision, [...selected.keys()])}
      onClose={onClose}
    >
      <SearchBox id="run-capture-search" noun="captures" placeholder="Search captures by name, notes or tag" value={search} onChange={setSearch} listError={listError} />
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
