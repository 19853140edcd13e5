/**
 * The chains a user can see (their own and the team's): name, owner, visibility, latest revision
 * and last change, with search, sort and paging kept in the URL, fork, and for those who compose
 * chains, new and import.
 */
import { useMemo, useRef, useState } from 'react';
import { useMutation } from '@tanstack/react-query';
import { buttonPrimary, buttonSecondary } from '@/components/ui';
import { ServerTableView } from '../table/ServerTableView';
import { TableNotice } from '../table/TableNotice';
import { useServerTable } from '../table/useServerTable';
import { useUrlState } from '../table/useUrlState';
import { urlSorting } from '../table/url-sorting';
import { withQueryClient } from '../table/withQueryClient';
import { fetchChainList, useCreateChain, useForkChain, type Chain, type ChainList as ChainPage } from './queries';
import { chainColumns } from './chain-columns';
import { readChainFile } from './import-chain';
import { CHAIN_PAGE_SIZES, chainListCodec, chainListParams, type ChainListState } from './list-state';

export interface ChainListProps {
  mayCreate: boolean;
  /** The list state the page's URL asked for (parsed on the server with the same codec). */
  initialState: ChainListState;
  /** The page of chains the server rendered for that state, shown before any request. */
  initialList: ChainPage;
}

function ChainList({ mayCreate, initialState, initialList }: ChainListProps) {
  const urlState = useUrlState(chainListCodec, initialState);
  const { state, settled, update } = urlState;
  const [notice, setNotice] = useState<{ tone: 'error' | 'ok'; text: string } | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const open = (id: string) => (window.location.href = `/chains/${id}`);
  const fork = useForkChain();
  const create = useCreateChain();
  const importFile = useMutation({
    mutationFn: async (file: File) => {
      const reading = readChainFile(await file.text(), file.name);
      if (!reading.ok) throw new Error(reading.message);
      try {
        return await create.mutateAsync({ name: reading.name, visibility: 'private', document: reading.document });
      } catch (error) {
        throw new Error(`${file.name}: ${(error as Error).message}`);
      }
    },
    onSuccess: (created) => open(created.id),
    onError: (error) => setNotice({ tone: 'error', text: error.message }),
  });

  const columns = useMemo(
    () =>
      chainColumns({
        onFork: (chain: Chain) =>
          fork.mutate({ id: chain.id }, { onSuccess: (created) => open(created.id), onError: (error) => setNotice({ tone: 'error', text: error.message }) }),
      }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [],
  );
  const { query, params, view } = useServerTable({
    queryKey: 'chains',
    urlState,
    initialState,
    initialList,
    toParams: chainListParams,
    fetchList: fetchChainList,
    rowsOf: (page: ChainPage) => page.items,
    columns,
    getRowId: (chain) => chain.id,
    sorting: urlSorting(urlState),
    canSelect: () => false,
  });

  const searched = settled.q.trim();
  return (
    <section aria-label="Chains" className="space-y-3" data-ready data-testid="chains-table" data-loading={query.isFetching || undefined}>
      <div className="flex flex-wrap items-center gap-2">
        <input
          type="search"
          value={state.q}
          onChange={(e) => update((current) => ({ ...current, q: e.target.value, page: 1 }), 'replace')}
          placeholder="Search by name or description"
          aria-label="Search chains"
          className="w-full max-w-sm rounded-md border border-line bg-surface px-3 py-1.5 text-sm"
        />
        <label className="flex items-center gap-1.5 text-sm text-muted">
          <input
            type="checkbox"
            className="h-4 w-4 accent-[rgb(var(--q-accent))]"
            checked={state.owner === 'me'}
            onChange={(e) => update((current) => ({ ...current, owner: e.target.checked ? 'me' : '', page: 1 }), 'push')}
          />
          Mine only
        </label>
        {mayCreate && (
          <div className="ml-auto flex gap-2">
            <button type="button" className={buttonSecondary + ' py-1.5'} onClick={() => fileRef.current?.click()} disabled={importFile.isPending}>
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
                if (file) importFile.mutate(file);
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
        <TableNotice tone={notice.tone} onDismiss={() => setNotice(null)}>
          {notice.text}
        </TableNotice>
      )}
      <ServerTableView
        {...view}
        noun="chains"
        caption={`Chains, sorted by ${params.sort} ${params.order === 'asc' ? 'ascending' : 'descending'}`}
        empty={
          searched
            ? `No chain matches “${searched}”.`
            : settled.owner === 'me'
              ? 'You have no chains of your own yet.'
              : mayCreate
                ? 'No chains yet: start one with New chain, or import a JSON file.'
                : 'No chain is shared with the team yet.'
        }
        pageSizes={CHAIN_PAGE_SIZES}
        cellPadding="px-3 py-2"
        cellAlign="middle"
        rowAttributes={(chain) => ({ 'data-chain': chain.id })}
      />
    </section>
  );
}

export default withQueryClient(ChainList, 10_000);
