/**
 * The chains API as TanStack Query hooks, over the one fetch function (apiJson): reads are
 * queries cached under `['chains', ...]`, writes are mutations that refresh what they changed.
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { ChainChange } from '@/lib/chain-diff';
import { apiJson, queryString } from '@/components/query/fetch';
import { storedChainDocumentOf, type Chain, type ChainChanges, type ChainList, type ChainWithRevision, type RevisionSummary, type RevisionWithDocument, type StoredChainDocument } from '@/contracts/chain';
import type { Visibility } from '@/contracts/capture';
import type { ChainListParams } from './list-state';

export type { Chain, ChainList, ChainWithRevision };

/** A revision with its document checked against the chain contract once, as it arrived. */
export type StoredRevision = Omit<RevisionWithDocument, 'document'> & { document: StoredChainDocument };

const base = (id: string) => `/api/chains/${encodeURIComponent(id)}`;

/** Query keys: everything about chains starts with 'chains', so one invalidation refreshes it all. */
export const chainKeys = {
  all: ['chains'] as const,
  chain: (id: string) => ['chains', 'one', id] as const,
  revisions: (id: string) => ['chains', 'one', id, 'revisions'] as const,
  revision: (id: string, revision: number) => ['chains', 'one', id, 'revision', revision] as const,
  diff: (id: string, from: number, to: number) => ['chains', 'one', id, 'diff', from, to] as const,
};

/** One page of the chains list (the list table's query function). */
export function fetchChainList(params: ChainListParams): Promise<ChainList> {
  return apiJson<ChainList>('GET', `/api/chains?${queryString(params)}`);
}

/** A chain with its latest revision, through the cache (for code outside a render). */
export function fetchChain(client: QueryClient, id: string): Promise<ChainWithRevision> {
  return client.fetchQuery({ queryKey: chainKeys.chain(id), queryFn: () => apiJson<ChainWithRevision>('GET', base(id)), staleTime: 0 });
}

/** A revision as the API answers it, its document read through the chain contract (a damaged one fails here). */
async function getRevision(id: string, revision: number): Promise<StoredRevision> {
  const answer = await apiJson<RevisionWithDocument>('GET', `${base(id)}/revisions/${revision}`);
  return { ...answer, document: storedChainDocumentOf(answer.document) };
}

/** One revision with its document; revisions never change, so a fetched one is kept. */
export function fetchRevision(client: QueryClient, id: string, revision: number): Promise<StoredRevision> {
  return client.fetchQuery({ queryKey: chainKeys.revision(id, revision), queryFn: () => getRevision(id, revision), staleTime: Infinity });
}

/** The same revision as a query; nothing is asked while no chain or revision is chosen. */
export function useRevision(id: string | null, revision: number | null) {
  return useQuery({
    queryKey: chainKeys.revision(id ?? '', revision ?? 0),
    queryFn: () => getRevision(id!, revision!),
    enabled: id !== null && revision !== null,
    staleTime: Infinity,
  });
}

/** One page of the chains list as a query (pickers); the previous page stays while the next loads. */
export function useChainList(params: ChainListParams) {
  return useQuery({ queryKey: [...chainKeys.all, 'list', params], queryFn: () => fetchChainList(params), placeholderData: keepPreviousData });
}

/** The revisions of a chain, newest first, without documents; nothing is asked while `id` is null. */
export function useRevisions(id: string | null) {
  return useQuery({
    queryKey: chainKeys.revisions(id ?? ''),
    queryFn: () => apiJson<{ items: RevisionSummary[] }>('GET', `${base(id!)}/revisions`).then((r) => r.items),
    enabled: id !== null,
  });
}

/** Parameter-level changes from revision `from` to `to` (revisions never change: kept once fetched). */
export function fetchDiff(client: QueryClient, id: string, from: number, to: number): Promise<ChainChange[]> {
  return client.fetchQuery({
    queryKey: chainKeys.diff(id, from, to),
    queryFn: () => apiJson<{ changes: ChainChange[] }>('GET', `${base(id)}/diff?from=${from}&to=${to}`).then((r) => r.changes),
    staleTime: Infinity,
  });
}

/** Refreshes the chain lists and this chain once a write went through. */
function useRefreshChains() {
  const client = useQueryClient();
  return () => client.invalidateQueries({ queryKey: chainKeys.all });
}

export function useCreateChain() {
  const refresh = useRefreshChains();
  return useMutation({
    mutationFn: (body: { name: string; visibility: Visibility; document: unknown; description?: string }) => apiJson<{ id: string; revision: number }>('POST', '/api/chains', body),
    onSuccess: refresh,
  });
}

export function useForkChain() {
  const refresh = useRefreshChains();
  return useMutation({
    mutationFn: ({ id, name }: { id: string; name?: string }) => apiJson<{ id: string; revision: number }>('POST', `${base(id)}/fork`, name ? { name } : {}),
    onSuccess: refresh,
  });
}

export function useUpdateChain() {
  const refresh = useRefreshChains();
  return useMutation({
    mutationFn: ({ id, ...body }: { id: string } & ChainChanges) => apiJson<Chain>('PATCH', base(id), body),
    onSuccess: refresh,
  });
}

export function useSaveRevision() {
  const refresh = useRefreshChains();
  return useMutation({
    mutationFn: ({ id, document, message }: { id: string; document: unknown; message: string }) => apiJson<RevisionWithDocument>('POST', `${base(id)}/revisions`, { document, message }),
    onSuccess: refresh,
  });
}

export function useRestoreRevision() {
  const refresh = useRefreshChains();
  return useMutation({
    mutationFn: ({ id, revision, message }: { id: string; revision: number; message?: string }) =>
      apiJson<RevisionWithDocument>('POST', `${base(id)}/restore`, { revision, ...(message ? { message } : {}) }),
    onSuccess: refresh,
  });
}

/** Address of a revision's document as a JSON download (the latest without `revision`). */
export function chainExportUrl(id: string, revision?: number): string {
  return `${base(id)}/export${revision ? `?revision=${revision}` : ''}`;
}
