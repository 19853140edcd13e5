import { useEffect, useMemo, useState } from 'react';
import type { Chain, RevisionSummary } from '@/contracts/chain';
import { input, label } from '../ui';
import type { Capture } from '../captures/types';
import { useChainList, useRevisions } from '../chains/queries';
import { DialogShell } from '../DialogShell';
import { withQueryClient } from '../table/withQueryClient';
import { DialogButton, SearchBox, useDebounced, useRevisionDocument, useRunSubmission } from './run-dialog-parts';
import { runBlocker } from './run-check';
import { utcMinute } from './format';

export interface RunChainProps {
  capture: Pick<Capture, 'id' | 'name' | 'sampleRate' | 'layout' | 'centerFrequency'>;
  /** Classes of the opening button (defaults to a secondary button). */
  className?: string;
}

/** "Run a chain…" on a capture page: opens a dialog to pick a chain and revision and run it on this capture. */
function RunChainOpener(props: RunChainProps) {
  return <DialogButton text="Run a chain…" testId="run-chain" className={props.className} dialog={(onClose) => <RunChainDialog {...props} onClose={onClose} />} />;
}

/** The opener as an island of its own (the capture page has no query cache around it). */
export const RunChainButton = withQueryClient(RunChainOpener, 10_000);

function RunChainDialog({ capture, onClose }: RunChainProps & { onClose: () => void }) {
  const [search, setSearch] = useState('');
  const q = useDebounced(search.trim(), 250);
  const list = useChainList({ q: q || undefined, sort: 'updatedAt', order: 'desc', page: 1, pageSize: 100 });
  const chains = useMemo(() => list.data?.items.filter((c) => c.permissions.run) ?? null, [list.data]);
  const listError = list.error ? list.error.message : null;
  const [chain, setChain] = useState<Chain | null>(null);
  const revisions = useRevisions(chain?.id ?? null).data ?? [];
  const [revision, setRevision] = useState<number | null>(null);
  const { document, failure } = useRevisionDocument(chain?.id ?? null, revision);
  const { busy, error, submit } = useRunSubmission();

  useEffect(() => {
    if (chain) setRevision(chain.latestRevision);
  }, [chain]);

  const blocker = useMemo(() => failure ?? (document === null ? null : runBlocker(document, capture)), [failure, document, capture]);

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
            {(revisions.length > 0 ? revisions : [{ revision: chain.latestRevision, message: '', createdAt: '' } as RevisionSummary]).map((r) => (
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
