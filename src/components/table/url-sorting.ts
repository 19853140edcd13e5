/**
 * A list's column sorting kept in its URL state: the table shows `sort` / `desc`, and a click on a
 * header writes the new order with a history entry (so Back undoes it) and returns to page 1.
 */
import type { SortingState } from '@tanstack/react-table';
import type { UrlState } from './useUrlState';

/** The state of a list that sorts by one column. */
export interface SortedListState {
  sort: string;
  desc: boolean;
  page: number;
}

/** The `sorting` option of useServerTable for a list whose sort lives in its URL state. */
export function urlSorting<S extends SortedListState>({ state, update }: Pick<UrlState<S>, 'state' | 'update'>): {
  state: SortingState;
  onChange: (next: SortingState) => void;
} {
  return {
    state: [{ id: state.sort, desc: state.desc }],
    onChange: (next) => {
      const first = next[0];
      if (first) update((current) => ({ ...current, sort: first.id as S['sort'], desc: first.desc, page: 1 }), 'push');
    },
  };
}
