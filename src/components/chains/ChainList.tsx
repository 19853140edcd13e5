/**
 * The chains a user can see (their own and the team's): name, owner, visibility, latest revision
 * and last change, with search, paging, fork, and for those who compose chains, new and import.
 */
import { useEffect, useRef, useState } from 'react';
import { buttonPrimary, buttonSecondary, buttonSmall } from '@/components/ui';
import { chainsApi, type Chain, type ChainList as ChainPage } from './api';
import { readChainFile } from './import-chain';
import { shortTime } from './RevisionsPanel';

const PAGE_SIZE = 25;

export default function ChainList({ mayCreate }: { mayCreate: boolean }) {
  const [query, setQuery] = useState('');
  const [page, setPage] = useState(1);
  const [data, setData] = useState<ChainPage | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);

  useEffect(() => {
    let live = true;
    const timer = setTimeout(() => {
      void chainsApi.list({ q: query.trim(), page, pageSize: PAGE_SIZE }).then((r) => {
        if (!live) return;
        if (r.ok) {
          setData(r.data);
          setError(null);
        } else setError(r.error.message);
      });
    }, 150);
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [query, page]);

  const fork = async (chain: Chain) => {
    const r = await chainsApi.fork(chain.id);
    if (r.ok) window.location.href = `/chains/${r.data.id}`;
    else setNotice({ tone: 'error', text: r.error.message });
  };

  const importFile = async (file: File) => {
    const reading = readChainFile(await file.text(), file.name);
    if (!reading.ok) return setNotice({ tone: 'error', text: reading.message });
    const r = await chainsApi.create({ name: reading.name, visibility: 'private', document: reading.document });
    if (r.ok) window.location.href = `/chains/${r.data.id}`;
    else setNotice({ tone: 'error', text: `${file.name}: ${r.error.message}` });
  };

  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  return (
    <div data-ready>
      <div className="mb-3 flex flex-wrap items-center gap-2">
        <input
          type="search"
          value={query}
          onChange={(e) => {
            setQuery(e.target.value);
            setPage(1);
          }}
          placeholder="Search by name or description"
          aria-label="Search chains"
          className="w-full max-w-sm rounded-md border border-line bg-surface px-3 py-1.5 text-sm"
        />
        {mayCreate && (
          <div className="ml-auto flex gap-2">
            <button type="button" className={buttonSecondary + ' py-1.5'} onClick={() => fileRef.current?.click()}>
              Import JSON file…
            </button>
            <input
              ref={fileRef}
              type="file"
              accept=".json,application/json"
              className="hidden"
              aria-label="Chain JSON file to import"
              data-testid="import-file"
              onChange={(e) => {
                const file = e.target.files?.[0];
                if (file) void importFile(file);
                e.target.value = '';
              }}
            />
            <a href="/chains/new" className={buttonPrimary + ' py-1.5'}>
              New chain
            </a>
          </div>
        )}
      </div>
      {notice && (
        <p role={notice.tone === 'error' ? 'alert' : 'status'} className={'mb-3 rounded-md border px-3 py-2 text-sm ' + (notice.tone === 'error' ? 'border-danger/40 bg-danger/10 text-danger' : 'border-ok/40 bg-ok/10 text-ok')}>
          {notice.text}
        </p>
      )}
      {error && <p className="text-sm text-danger">{error}</p>}
      <div className="overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full text-sm">
          <thead className="border-b border-line bg-surface text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="px-3 py-2 font-medium">Name</th>
              <th className="px-3 py-2 font-medium">Owner</th>
              <th className="px-3 py-2 font-medium">Visibility</th>
              <th className="px-3 py-2 text-right font-medium">Revision</th>
              <th className="px-3 py-2 font-medium">Updated</th>
              <th className="px-3 py-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {data?.items.map((chain) => (
              <tr key={chain.id} className="border-b border-line/70 last:border-0 hover:bg-surface/60" data-chain={chain.id}>
                <td className="px-3 py-2">
                  <a href={`/chains/${chain.id}`} className="font-medium hover:text-accent hover:underline">
                    {chain.name}
                  </a>
                  {chain.description && <span className="block max-w-xl truncate text-xs text-muted">{chain.description}</span>}
                </td>
                <td className="px-3 py-2 text-muted">{chain.owner.name}</td>
                <td className="px-3 py-2">
                  <span className={'rounded px-1.5 py-px text-xs ' + (chain.visibility === 'team' ? 'bg-accent/10 text-accent' : 'bg-muted/15 text-muted')}>{chain.visibility}</span>
                </td>
                <td className="px-3 py-2 text-right font-mono">r{chain.latestRevision}</td>
                <td className="whitespace-nowrap px-3 py-2 text-muted">{shortTime(chain.updatedAt)}</td>
                <td className="px-3 py-2 text-right">
                  {chain.permissions.fork && (
                    <button type="button" className={buttonSmall} onClick={() => void fork(chain)} aria-label={`Fork ${chain.name}`}>
                      Fork
                    </button>
                  )}
                </td>
              </tr>
            ))}
            {data && data.items.length === 0 && (
              <tr>
                <td colSpan={6} className="px-3 py-6 text-center text-muted">
                  {query ? `No chain matches “${query}”.` : mayCreate ? 'No chains yet: start one with New chain, or import a JSON file.' : 'No chain is shared with the team yet.'}
                </td>
              </tr>
            )}
            {!data && !error && (
              <tr>
                <td colSpan={6} className="px-3 py-6 text-center text-muted">
                  Loading…
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {data && pages > 1 && (
        <div className="mt-2 flex items-center justify-end gap-2 text-sm">
          <button type="button" className={buttonSmall} disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>
            Previous
          </button>
          <span className="text-muted">
            Page {page} of {pages}
          </span>
          <button type="button" className={buttonSmall} disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>
            Next
          </button>
        </div>
      )}
    </div>
  );
}
