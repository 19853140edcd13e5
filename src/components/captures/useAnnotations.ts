import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ApiResult } from '../forms/api';
import { fetchCapture, updateCapture } from './api';
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
    mutationFn: (list: Record<string, unknown>[]): Promise<ApiResult<Capture>> => updateCapture(captureId, { annotations: list }),
    onSuccess: (result) => {
      if (!result.ok) return;
      queryClient.setQueryData(key, result.data.annotations);
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  return { annotations: query.data, save: mutation.mutateAsync, saving: mutation.isPending };
}
