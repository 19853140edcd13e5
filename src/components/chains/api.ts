/**
 * Shapes of the chains API as the browser sees them. The chains pages call the API through the
 * query hooks of ./queries; `chainsApi` below remains only for the runs dialogs, which move onto
 * those hooks with the runs pages' own rework.
 */
import { requestJson, type ApiResult } from '@/components/query/fetch';
import type { ChainChange } from '@/lib/chain-diff';

export interface ChainPermissions {
  update: boolean;
  delete: boolean;
  fork: boolean;
  run: boolean;
}

export interface Revision {
  chainId: string;
  revision: number;
  /** Present on single-revision answers; lists may leave it out. */
  document?: unknown;
  message: string;
  author: { id: string; name: string };
  createdAt: string;
  hash: string;
}

export interface Chain {
  id: string;
  name: string;
  description: string | null;
  owner: { id: string; name: string };
  visibility: 'private' | 'team';
  latestRevision: number;
  createdAt: string;
  updatedAt: string;
  forkedFrom: { chainId: string; revision: number } | null;
  permissions: ChainPermissions;
}

export interface ChainWithRevision extends Chain {
  revision: Revision;
}

export interface ChainList {
  items: Chain[];
  total: number;
  page: number;
  pageSize: number;
}

const base = (id: string) => `/api/chains/${encodeURIComponent(id)}`;

/** @deprecated in the chains pages: use the hooks of ./queries. */
export const chainsApi = {
  list: (query: { q?: string; page?: number; pageSize?: number; owner?: string }) => {
    const params = new URLSearchParams();
    for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== '') params.set(k, String(v));
    return requestJson<ChainList>('GET', `/api/chains?${params}`);
  },
  get: (id: string) => requestJson<ChainWithRevision>('GET', base(id)),
  create: (body: { name: string; visibility: 'private' | 'team'; document: unknown; description?: string }) => requestJson<{ id: string; revision: number }>('POST', '/api/chains', body),
  update: (id: string, body: { name?: string; description?: string; visibility?: 'private' | 'team' }) => requestJson<Chain>('PATCH', base(id), body),
  remove: (id: string) => requestJson<null>('DELETE', base(id)),
  revisions: (id: string) => requestJson<{ items: Revision[] }>('GET', `${base(id)}/revisions`),
  revision: (id: string, n: number) => requestJson<Revision>('GET', `${base(id)}/revisions/${n}`),
  save: (id: string, document: unknown, message: string) => requestJson<Revision>('POST', `${base(id)}/revisions`, { document, message }),
  diff: (id: string, from: number, to: number) => requestJson<{ changes: ChainChange[] }>('GET', `${base(id)}/diff?from=${from}&to=${to}`),
  restore: (id: string, revision: number, message?: string) => requestJson<Revision>('POST', `${base(id)}/restore`, { revision, ...(message ? { message } : {}) }),
  fork: (id: string, name?: string) => requestJson<{ id: string; revision: number }>('POST', `${base(id)}/fork`, name ? { name } : {}),
  exportUrl: (id: string, revision?: number) => `${base(id)}/export${revision ? `?revision=${revision}` : ''}`,
};

export type { ApiResult };
