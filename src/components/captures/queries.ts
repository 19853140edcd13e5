/**
 * The captures API as TanStack Query functions and hooks, over the one fetch function (apiJson):
 * reads are cached under `['captures', ...]` (annotations under their own key), writes are
 * mutations that refresh the lists they changed.
 */
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiJson, queryString } from '@/components/query/fetch';
import type { CaptureChanges } from '@/contracts/capture';
import type { CaptureListParams } from './api';
import type { Capture, CaptureList } from './types';

const base = (id: string) => `/api/captures/${encodeURIComponent(id)}`;

/** One page of captures (the list table's query function). */
export function fetchCaptureList(params: CaptureListParams): Promise<CaptureList> {
  return apiJson<CaptureList>('GET', `/api/captures?${queryString(params)}`);
}

/** One page of captures as a query (pickers); the previous page stays while the next loads. */
export function useCaptureList(params: CaptureListParams) {
  return useQuery({ queryKey: ['captures', 'list', params], queryFn: () => fetchCaptureList(params), placeholderData: keepPreviousData });
}

/** One capture as the API presents it. */
export function fetchCapture(id: string): Promise<Capture> {
  return apiJson<Capture>('GET', base(id));
}

/** Answer of the bulk delete: what went, and what was refused with the reason's code. */
export interface BulkDeleteResult {
  deleted: string[];
  refused: { id: string; code: string }[];
}

/** Refreshes every captures list once a write went through. */
function useRefreshCaptures() {
  const client = useQueryClient();
  return () => client.invalidateQueries({ queryKey: ['captures'] });
}

export function useDeleteCapture() {
  const refresh = useRefreshCaptures();
  return useMutation({ mutationFn: (id: string) => apiJson<null>('DELETE', base(id)), onSuccess: refresh });
}

export function useBulkDeleteCaptures() {
  const refresh = useRefreshCaptures();
  return useMutation({ mutationFn: (ids: string[]) => apiJson<BulkDeleteResult>('POST', '/api/captures/bulk-delete', { ids }), onSuccess: refresh });
}

/** PATCH of the fields the owner may change; answers the capture as stored. */
export function useUpdateCapture() {
  const refresh = useRefreshCaptures();
  return useMutation({ mutationFn: ({ id, changes }: { id: string; changes: CaptureChanges }) => apiJson<Capture>('PATCH', base(id), changes), onSuccess: refresh });
}
