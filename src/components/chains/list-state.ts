/**
 * State of the chains list (search words, owner, sort, page) and its address-bar form, e.g.
 * `?q=beacon&owner=me&sort=name&page=2`, so a list can be bookmarked, shared and returned to. The
 * server page and the island read it with the same code.
 */
import { buildSearch, oneOf, pageNumber, pageSizeFrom, searchParams, sortFrom, sortText, type UrlCodec } from '../table/url-state';

/** Columns the list endpoint sorts by. */
export type ChainSortKey = 'name' | 'updatedAt' | 'createdAt' | 'latestRevision';

/** Everything that decides which chains the list shows. */
export interface ChainListState {
  /** Words to find in the name or description, as typed. */
  q: string;
  /** `me` for the user's own chains only, empty for all they can see. */
  owner: '' | 'me';
  sort: ChainSortKey;
  desc: boolean;
  /** 1-based. */
  page: number;
  /** Rows per page. */
  pageSize: number;
}

/** The list endpoint's parameters. */
export interface ChainListParams {
  q?: string;
  owner?: 'me';
  sort: ChainSortKey;
  order: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

export const CHAIN_PAGE_SIZES = [10, 25, 50, 100] as const;

export const defaultChainListState: ChainListState = { q: '', owner: '', sort: 'updatedAt', desc: true, page: 1, pageSize: 25 };

// Short URL words for the endpoint's sort keys.
const SORT_NAMES: Record<string, ChainSortKey> = { name: 'name', updated: 'updatedAt', created: 'createdAt', revision: 'latestRevision' };
// The API refuses longer searches; a longer one in a link is not a search anyone typed.
const MAX_QUERY = 200;

/** Chains list state from a query string; values it does not know take their defaults. */
export function parseChainListState(search: string): ChainListState {
  const params = searchParams(search);
  const fallback = defaultChainListState;
  const sort = sortFrom(params.get('sort'), SORT_NAMES, { key: fallback.sort, desc: fallback.desc });
  const q = params.get('q');
  return {
    q: q !== null && q.length <= MAX_QUERY ? q : '',
    owner: oneOf(params.get('owner'), ['me'] as const) ?? '',
    sort: sort.key,
    desc: sort.desc,
    page: pageNumber(params.get('page')),
    pageSize: pageSizeFrom(params.get('per_page'), CHAIN_PAGE_SIZES, fallback.pageSize),
  };
}

/** Query string of a chains list state (defaults and blank search left out). */
export function serializeChainListState(state: ChainListState): string {
  const fallback = defaultChainListState;
  return buildSearch([
    ['q', state.q.trim()],
    ['owner', state.owner],
    ['sort', sortText(state.sort, state.desc, SORT_NAMES), sortText(fallback.sort, fallback.desc, SORT_NAMES)],
    ['page', state.page, 1],
    ['per_page', state.pageSize, fallback.pageSize],
  ]);
}

export const chainListCodec: UrlCodec<ChainListState> = { parse: parseChainListState, serialize: serializeChainListState };

/** The list endpoint's parameters for a state. */
export function chainListParams(state: ChainListState): ChainListParams {
  return {
    q: state.q.trim() || undefined,
    owner: state.owner || undefined,
    sort: state.sort,
    order: state.desc ? 'desc' : 'asc',
    page: state.page,
    pageSize: state.pageSize,
  };
}
