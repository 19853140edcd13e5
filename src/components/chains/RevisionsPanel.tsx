/**
 * The chain's saved revisions, newest first: view any of them read-only, restore one (which saves
 * it again as a new revision), and compare two at parameter level.
 */
import { useEffect, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { ChainChange } from '@/lib/chain-diff';
import { buttonSmall } from '@/components/ui';
import { fetchDiff, useRevisions } from './queries';

interface RevisionsPanelProps {
  chainId: string;
  latest: number;
  viewing: number | null;
  onView(revision: number | null): void;
}

export function shortTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return date.toLocaleString('en-GB', { day: '2-digit', month: 'short', hour: '2-digit', minute: '2-digit' });
}

export default function RevisionsPanel({ chainId, latest, viewing, onView }: RevisionsPanelProps) {
  const client = useQueryClient();
  // Saving and restoring invalidate the chain's queries, so the list follows on its own.
  const revisions = useRevisions(chainId);
  const items = revisions.data ? [...revisions.data].sort((a, b) => b.revision - a.revision) : null;
  const error = revisions.error?.message ?? null;
  const [from, setFrom] = useState(Math.max(1, latest - 1));
  const [to, setTo] = useState(latest);
  const [changes, setChanges] = useState<ChainChange[] | null>(null);
  const [diffError, setDiffError] = useState<string | null>(null);

  // A new latest revision moves the comparison to the newest pair.
  useEffect(() => {
    setFrom(Math.max(1, latest - 1));
    setTo(latest);
  }, [chainId, latest]);

  const compare = async () => {
    setDiffError(null);
    try {
      setChanges(await fetchDiff(client, chainId, from, to));
    } catch (failure) {
      setDiffError((failure as Error).message);
    }
  };

  return (
    <section className="rounded-lg border border-line bg-panel p-3" aria-labelledby="revisions-title" data-testid="revisions-panel">
      <h2 id="revisions-title" className="mb-2 text-sm font-semibold">
        Revisions
      </h2>
      {error && <p className="text-xs text-danger">{error}</p>}
      {!items && !error && <p className="text-xs text-muted">Loading…</p>}
      {items && (
        <ol className="max-h-64 space-y-0.5 overflow-y-auto pr-1">
          {items.map((r) => {
            const current = viewing === r.revision || (viewing === null && r.revision === latest);
            return (
              <li key={r.revision} className={'flex items-start gap-2 rounded px-1.5 py-1 ' + (current ? 'bg-accent/10' : '')} data-revision={r.revision}>
                <span className="w-8 shrink-0 font-mono text-xs font-semibold">r{r.revision}</span>
                <span className="min-w-0 flex-1">
                  <span className="block truncate text-xs" title={r.message}>
                    {r.message || <span className="text-muted">no message</span>}
                  </span>
                  <span className="block text-[11px] text-muted">
                    {r.author.name} · {shortTime(r.createdAt)}
                  </span>
                </span>
                {r.revision === latest ? (
                  viewing !== null ? (
                    <button type="button" className={buttonSmall} onClick={() => onView(null)}>
                      Edit
                    </button>
                  ) : (
                    <span className="px-1 text-[11px] text-muted">latest</span>
                  )
                ) : (
                  <button type="button" className={buttonSmall} onClick={() => onView(r.revision)} aria-label={`View revision ${r.revision}`} disabled={viewing === r.revision}>
                    View
                  </button>
                )}
              </li>
            );
          })}
        </ol>
      )}
      {latest > 1 && (
        <div className="mt-3 border-t border-line pt-2">
          <div className="flex items-end gap-2 text-xs">
            <RevisionSelect caption="From" latest={latest} value={from} onChange={setFrom} />
            <RevisionSelect caption="To" latest={latest} value={to} onChange={setTo} />
            <button type="button" className={buttonSmall + ' py-1.5'} onClick={() => void compare()}>
              Compare
            </button>
          </div>
          {diffError && <p className="mt-1 text-xs text-danger">{diffError}</p>}
          {changes && <ChangeList changes={changes} />}
        </div>
      )}
    </section>
  );
}

/** One end of the comparison: a revision number from 1 to `latest`. */
function RevisionSelect({ caption, latest, value, onChange }: { caption: 'From' | 'To'; latest: number; value: number; onChange: (revision: number) => void }) {
  return (
    <label className="flex-1">
      <span className="mb-0.5 block text-muted">{caption}</span>
      <select
        className="w-full rounded border border-line bg-surface px-1 py-1 font-mono"
        value={value}
        onChange={(e) => onChange(Number(e.target.value))}
        aria-label={`Compare ${caption.toLowerCase()} revision`}
      >
        {Array.from({ length: latest }, (_, i) => i + 1).map((n) => (
          <option key={n} value={n}>
            r{n}
          </option>
        ))}
      </select>
    </label>
  );
}

/** A parameter-level difference as a compact list. */
export function ChangeList({ changes }: { changes: ChainChange[] }) {
  if (changes.length === 0) return <p className="mt-2 text-xs text-muted">No difference.</p>;
  return (
    <ul className="mt-2 space-y-1 font-mono text-[12px]" data-testid="diff-list">
      {changes.map((c, n) => (
        <li key={n} className="leading-4">
          <span className={c.change === 'added' ? 'text-ok' : c.change === 'removed' ? 'text-danger' : 'text-accent'}>{c.change}</span>{' '}
          <span className="font-semibold">{c.stageId ?? 'document'}</span>
          {c.kind && <span className="text-muted"> ({c.kind})</span>}
          {c.change === 'changed' && c.field && (
            <span className="block pl-3">
              {c.field}: <span className="text-danger line-through decoration-1">{show(c.before)}</span> → <span className="text-ok">{show(c.after)}</span>
            </span>
          )}
          {c.change === 'moved' && <span className="text-muted"> position {Number(c.before) + 1} → {Number(c.after) + 1}</span>}
        </li>
      ))}
    </ul>
  );
}

function show(value: unknown): string {
  if (value === undefined) return 'unset';
  const text = JSON.stringify(value);
  return text.length > 60 ? text.slice(0, 57) + '…' : text;
}
