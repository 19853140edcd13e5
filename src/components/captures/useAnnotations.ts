import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiJson, failureOf, type ApiResult } from '@/components/query/fetch';
import { fetchCapture } from './queries';
import type { Capture } from './types';

/** Query key of a capture's SigMF annotations. */
export const annotationsKey = (captureId: string) => ['capture', captureId, 'annotations'] as const;

/**
 * A capture's SigMF annotations through TanStack Query, starting from what the page was rendered
 * with, and `save` which sends the whole list by PATCH and puts the server's canonical answer in
 * the cache, so the list and the spectrogram boxes redraw without a reload.
 */
export function useAnnotations(captureId: string, initial: Record<string, unknown>[]) {
  const queryClient = useQueryClient();
  const key = annotationsKey(captureId);
  const query = useQuery({
    queryKey: key,
    queryFn: async () => (await fetchCapture(captureId)).annotations,
    initialData: initial,
    // The page was rendered a moment ago: no need to ask again on mount.
    staleTime: 60_000,
  });
  const mutation = useMutation({
    mutationFn: (list: Record<string, unknown>[]) => apiJson<Capture>('PATCH', `/api/captures/${encodeURIComponent(captureId)}`, { annotations: list }),
    onSuccess: (capture) => {
      queryClient.setQueryData(key, capture.annotations);
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  // The annotation form places an API error beside its field: it takes the outcome as a result.
  const save = async (list: Record<string, unknown>[]): Promise<ApiResult<Capture>> => {
    try {
      return { ok: true, status: 200, data: await mutation.mutateAsync(list) };
    } catch (error) {
      return failureOf(error);
    }
  };
  return { annotations: query.data, save, saving: mutation.isPending };
}
