/**
 * State of the runs list (status filter, whole queue, page) and its address-bar form, e.g.
 * `?status=failed&page=2`. The list is always newest first, so there is no sort to keep.
 */
import { buildSearch, pageNumber, pageSizeFrom, searchParams, type UrlCodec } from '../table/url-state';
import type { RunListParams } from './api';

/** Everything that decides which runs the list shows. */
export interface RunListState {
  /** One of STATUS_FILTERS' values ('' for every status). */
  status: string;
  /** Admins: every user's runs. */
  all: boolean;
  /** 1-based. */
  page: number;
  /** Rows per page. */
  pageSize: number;
}

/** The status choices the list offers; a value is the endpoint's comma-separated status list. */
export const STATUS_FILTERS = [
  { value: '', label: 'Every status' },
  { value: 'queued,running', label: 'Queued or running' },
  { value: 'succeeded', label: 'Succeeded' },
  { value: 'failed', label: 'Failed' },
  { value: 'cancelled', label: 'Cancelled' },
] as const;

export const RUN_PAGE_SIZES = [25, 50, 100] as const;

export const defaultRunListState: RunListState = { status: '', all: false, page: 1, pageSize: 50 };

// The order STATUS_FILTERS writes statuses in, so `running,queued` reads as the same choice.
const STATUS_ORDER = ['queued', 'running', 'succeeded', 'failed', 'cancelled'];

function statusChoice(text: string | null): string {
  if (!text) return '';
  const statuses = text.split(',').map((word) => word.trim());
  if (statuses.some((status) => !STATUS_ORDER.includes(status))) return '';
  const written = [...new Set(statuses)].sort((a, b) => STATUS_ORDER.indexOf(a) - STATUS_ORDER.indexOf(b)).join(',');
  return STATUS_FILTERS.some((choice) => choice.value === written) ? written : '';
}

/**
 * The runs list's URL codec. Only viewers who may see the whole queue can have `all`: for others
 * `all=1` in a link is dropped rather than asked for and refused.
 */
export function runListCodec(canSeeQueue: boolean): UrlCodec<RunListState> {
  return {
    parse(search) {
      const params = searchParams(search);
      return {
        status: statusChoice(params.get('status')),
        all: canSeeQueue && params.get('all') === '1',
        page: pageNumber(params.get('page')),
        pageSize: pageSizeFrom(params.get('per_page'), RUN_PAGE_SIZES, defaultRunListState.pageSize),
      };
    },
    serialize(state) {
      return buildSearch([
        ['status', state.status],
        ['all', state.all && canSeeQueue ? '1' : undefined],
        ['page', state.page, 1],
        ['per_page', state.pageSize, defaultRunListState.pageSize],
      ]);
    },
  };
}

/** The list endpoint's parameters for a state. */
export function runListParams(state: RunListState): RunListParams {
  return { all: state.all, status: state.status || undefined, page: state.page, pageSize: state.pageSize };
}
