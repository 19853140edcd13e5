import { useEffect, useMemo, useState } from 'react';
import { input, label } from '../ui';
import type { Capture } from '../captures/types';
import { chainsApi, type Chain, type Revision } from '../chains/api';
import { DialogShell } from '../DialogShell';
import { DialogButton, SearchBox, useDebounced, useRevisionDocument, useRunSubmission } from './run-dialog-parts';
import { runBlocker } from './run-check';
import { utcMinute } from './format';

export interface RunChainProps {
  capture: Pick<Capture, 'id' | 'name' | 'sampleRate' | 'layout' | 'centerFrequency'>;
  /** Classes of the opening button (defaults to a secondary button). */
  className?: string;
}

/** "Run a chain…" on a capture page: opens a dialog to pick a chain and revision and run it on this capture. */
export function RunChainButton(props: RunChainProps) {
  return <DialogButton text="Run a chain…" testId="run-chain" className={props.className} dialog={(onClose) => <RunChainDialog {...props} onClose={onClose} />} />;
}

function RunChainDialog({ capture, onClose }: RunChainProps & { onClose: () => void }) {
  const [search, setSearch] = useState('');
  const q = useDebounced(search.trim(), 250);
  const [chains, setChains] = useState<Chain[] | null>(null);
  const [listError, setListError] = useState<string | null>(null);
  const [chain, setChain] = useState<Chain | null>(null);
  const [revisions, setRevisions] = useState<Revision[]>([]);
  const [revision, setRevision] = useState<number | null>(null);
  const document = useRevisionDocument(chain?.id ?? null, revision);
  const { busy, error, submit } = useRunSubmission();

  useEffect(() => {
    let live = true;
    void chainsApi.list({ q: q || undefined, pageSize: 100 }).then((result) => {
      if (!live) return;
      if (!result.ok) return setListError(result.error.message);
      setListError(null);
      setChains(result.data.items.filter((c) => c.permissions.run));
    });
    return () => {
      live = false;
    };
  }, [q]);

  useEffect(() => {
    if (!chain) return;
    let live = true;
    setRevisions([]);
    setRevision(chain.latestRevision);
    void chainsApi.revisions(chain.id).then((result) => {
      if (live && result.ok) setRevisions(result.data.items);
    });
    return () => {
      live = false;
    };
  }, [chain]);

  const blocker = useMemo(() => (document === null ? null : runBlocker(document, capture)), [document, capture]);

  return (
    <DialogShell
      title="Run a chain on this capture"
      subtitle={<span className="font-medium text-ink">{capture.name}</span>}
      confirmLabel={chain && revision !== null ? `Run r${revision}` : 'Run'}
      confirmDisabled={!chain || revision === null || Boolean(blocker)}
      busy={busy}
      error={error}
      confirmTestId="run-dialog-submit"
      onConfirm={() => chain && revision !== null && void submit(chain.id, revision, [capture.id])}
      onClose={onClose}
    >
      <SearchBox id="run-chain-search" noun="chains" placeholder="Search chains by name" value={search} onChange={setSearch} listError={listError} />
      <ul className="mt-3 max-h-72 divide-y divide-line overflow-y-auto rounded-md border border-line" role="radiogroup" aria-label="Chain">
        {chains === null && !listError && <li className="px-3 py-4 text-sm text-muted">Loading the chains…</li>}
        {chains?.length === 0 && <li className="px-3 py-4 text-sm text-muted">No chain you may run matches.</li>}
        {chains?.map((c) => (
          <li key={c.id}>
            <label className="flex cursor-pointer items-start gap-3 px-3 py-2 hover:bg-surface">
              <input
                type="radio"
                name="run-chain"
                className="mt-1 h-4 w-4 accent-[rgb(var(--q-accent))]"
                checked={chain?.id === c.id}
                onChange={() => setChain(c)}
              />
              <span className="min-w-0 flex-1">
                <span className="block truncate text-sm font-medium">{c.name}</span>
                <span className="flex flex-wrap gap-x-3 text-xs text-muted">
                  <span className="font-mono">r{c.latestRevision}</span>
                  <span>{c.owner.name}</span>
                  <span>{c.visibility === 'team' ? 'team' : 'private'}</span>
                </span>
              </span>
            </label>
          </li>
        ))}
      </ul>
      {chain && (
        <div className="mt-4">
          <label className={label} htmlFor="run-chain-revision">
            Revision of {chain.name}
          </label>
          <select id="run-chain-revision" className={input} value={revision ?? chain.latestRevision} onChange={(e) => setRevision(Number(e.target.value))}>
            {(revisions.length > 0 ? revisions : [{ revision: chain.latestRevision, message: '', createdAt: '' } as Revision]).map((r) => (
              <option key={r.revision} value={r.revision}>
                r{r.revision}
                {r.revision === chain.latestRevision ? ' (latest)' : ''}
                {r.createdAt ? ` · ${utcMinute(r.createdAt)}` : ''}
                {r.message ? ` · ${r.message}` : ''}
              </option>
            ))}
          </select>
          {blocker && (
            <p role="alert" className="mt-2 text-sm text-danger">
              This revision cannot run on this capture: {blocker}
            </p>
          )}
        </div>
      )}
    </DialogShell>
  );
}
