/**
 * Calls of the chains API; the shapes are the chain contract's (src/contracts/chain.ts), the server's own. The chains pages call the API through the
 * query hooks of ./queries; `chainsApi` below remains only for the runs dialogs, which move onto
 * those hooks with the runs pages' own rework.
 */
import { requestJson, type ApiResult } from '@/components/query/fetch';
import type { ChainChange } from '@/lib/chain-diff';
import type { Chain, ChainList, ChainWithRevision, RevisionSummary, RevisionWithDocument } from '@/contracts/chain';
import type { Visibility } from '@/contracts/capture';

export type { Chain, ChainList, ChainPermissions, ChainWithRevision, RevisionSummary, RevisionWithDocument } from '@/contracts/chain';

/** A revision as a list holds it: the summary, with its document when the answer carried one. */
export type Revision = RevisionSummary & Partial<Pick<RevisionWithDocument, 'document'>>;

const base = (id: string) => `/api/chains/${encodeURIComponent(id)}`;

/** @deprecated in the chains pages: use the hooks of ./queries. */
export const chainsApi = {
  list: (query: { q?: string; page?: number; pageSize?: number; owner?: string }) => {
    const params = new URLSearchParams();
    for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== '') params.set(k, String(v));
    return requestJson<ChainList>('GET', `/api/chains?${params}`);
  },
  get: (id: string) => requestJson<ChainWithRevision>('GET', base(id)),
  create: (body: { name: string; visibility: Visibility; document: unknown; description?: string }) => requestJson<{ id: string; revision: number }>('POST', '/api/chains', body),
  update: (id: string, body: { name?: string; description?: string; visibility?: Visibility }) => requestJson<Chain>('PATCH', base(id), body),
  remove: (id: string) => requestJson<null>('DELETE', base(id)),
  revisions: (id: string) => requestJson<{ items: RevisionSummary[] }>('GET', `${base(id)}/revisions`),
  revision: (id: string, n: number) => requestJson<RevisionWithDocument>('GET', `${base(id)}/revisions/${n}`),
  save: (id: string, document: unknown, message: string) => requestJson<RevisionWithDocument>('POST', `${base(id)}/revisions`, { document, message }),
  diff: (id: string, from: number, to: number) => requestJson<{ changes: ChainChange[] }>('GET', `${base(id)}/diff?from=${from}&to=${to}`),
  restore: (id: string, revision: number, message?: string) => requestJson<RevisionWithDocument>('POST', `${base(id)}/restore`, { revision, ...(message ? { message } : {}) }),
  fork: (id: string, name?: string) => requestJson<{ id: string; revision: number }>('POST', `${base(id)}/fork`, name ? { name } : {}),
  exportUrl: (id: string, revision?: number) => `${base(id)}/export${revision ? `?revision=${revision}` : ''}`,
};

export type { ApiResult };
