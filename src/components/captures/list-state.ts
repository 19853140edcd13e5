/**
 * State of the captures list (filters as typed, sort, page) and its address-bar form, e.g.
 * `?q=beacon&owner=me&datatype=cf32_le&rate_min=40M&sort=-size&page=2`, so a list can be
 * bookmarked, shared and returned to. The server page and the island read it with the same code.
 */
import { SIGMF_DATATYPES } from '@/dsp/formats/datatype';
import { parseQuantity } from '@/lib/units';
import { buildSearch, oneOf, pageNumber, pageSizeFrom, searchParams, sortFrom, sortText, type UrlCodec } from '../table/url-state';
import type { CaptureListParams } from './api';

/** Filter inputs as typed (rates are text with SI prefixes until parsed). */
export interface FilterValues {
  q: string;
  owner: string;
  tag: string;
  layout: string;
  datatype: string;
  minRate: string;
  maxRate: string;
}

export const emptyFilters: FilterValues = { q: '', owner: '', tag: '', layout: '', datatype: '', minRate: '', maxRate: '' };

type SortKey = CaptureListParams['sort'];

/** Everything that decides which captures the list shows. */
export interface CaptureListState {
  filters: FilterValues;
  sort: SortKey;
  desc: boolean;
  /** 1-based. */
  page: number;
  /** Rows per page. */
  pageSize: number;
}

export const CAPTURE_PAGE_SIZES = [10, 25, 50, 100] as const;

export const defaultCaptureListState: CaptureListState = { filters: emptyFilters, sort: 'createdAt', desc: true, page: 1, pageSize: 25 };

// Short URL words for the endpoint's sort keys.
const SORT_NAMES: Record<string, SortKey> = { name: 'name', created: 'createdAt', size: 'byteSize', rate: 'sampleRate' };
const OWNERS = ['me', 'team'] as const;
const LAYOUTS = ['complex', 'real', 'real-pair'] as const;
const RATE_ALIASES = ['sps', 'S/s'];
// The API refuses longer texts; a longer one in a link is not a search anyone typed.
const MAX_TEXT = { q: 200, tag: 40, rate: 32 };

/** A typed rate bound in Hz: undefined when empty, or the parser's complaint. */
export function parseRate(text: string): { value?: number; error?: string } {
  if (text.trim() === '') return {};
  const parsed = parseQuantity(text, 'Hz', { aliases: RATE_ALIASES });
  if (!parsed.ok) return { error: parsed.message };
  if (parsed.value < 0) return { error: 'must be 0 or more' };
  return { value: parsed.value };
}

function text(value: string | null, max: number): string {
  return value !== null && value.length <= max ? value : '';
}

/** A rate bound as given when it reads as a rate (e.g. `40M`, `4 MHz`), else empty. */
function rateText(value: string | null): string {
  const given = text(value, MAX_TEXT.rate).trim();
  return parseRate(given).value === undefined ? '' : given;
}

/** Captures list state from a query string; values it does not know take their defaults. */
export function parseCaptureListState(search: string): CaptureListState {
  const params = searchParams(search);
  const fallback = defaultCaptureListState;
  const sort = sortFrom(params.get('sort'), SORT_NAMES, { key: fallback.sort, desc: fallback.desc });
  return {
    filters: {
      q: text(params.get('q'), MAX_TEXT.q),
      owner: oneOf(params.get('owner'), OWNERS) ?? '',
      tag: text(params.get('tag'), MAX_TEXT.tag).trim(),
      layout: oneOf(params.get('layout'), LAYOUTS) ?? '',
      datatype: oneOf(params.get('datatype'), SIGMF_DATATYPES) ?? '',
      minRate: rateText(params.get('rate_min')),
      maxRate: rateText(params.get('rate_max')),
    },
    sort: sort.key,
    desc: sort.desc,
    page: pageNumber(params.get('page')),
    pageSize: pageSizeFrom(params.get('per_page'), CAPTURE_PAGE_SIZES, fallback.pageSize),
  };
}

/** Query string of a captures list state (defaults, blank text and unreadable rates left out). */
export function serializeCaptureListState(state: CaptureListState): string {
  const { filters } = state;
  const fallback = defaultCaptureListState;
  const rate = (value: string) => (parseRate(value).value === undefined ? undefined : value.trim());
  return buildSearch([
    ['q', filters.q.trim()],
    ['owner', filters.owner],
    ['tag', filters.tag.trim()],
    ['layout', filters.layout],
    ['datatype', filters.datatype],
    ['rate_min', rate(filters.minRate)],
    ['rate_max', rate(filters.maxRate)],
    ['sort', sortText(state.sort, state.desc, SORT_NAMES), sortText(fallback.sort, fallback.desc, SORT_NAMES)],
    ['page', state.page, 1],
    ['per_page', state.pageSize, fallback.pageSize],
  ]);
}

export const captureListCodec: UrlCodec<CaptureListState> = { parse: parseCaptureListState, serialize: serializeCaptureListState };

/** The list endpoint's parameters for a state; rates in Hz, unreadable rate text ignored. */
export function captureListParams(state: CaptureListState): CaptureListParams {
  const { filters } = state;
  return {
    q: filters.q.trim() || undefined,
    owner: filters.owner || undefined,
    tag: filters.tag.trim() || undefined,
    layout: filters.layout || undefined,
    datatype: filters.datatype || undefined,
    minRate: parseRate(filters.minRate).value,
    maxRate: parseRate(filters.maxRate).value,
    sort: state.sort,
    order: state.desc ? 'desc' : 'asc',
    page: state.page,
    pageSize: state.pageSize,
  };
}

/** True when any filter holds something. */
export function hasFilters(filters: FilterValues): boolean {
  return Object.values(filters).some((value) => value !== '');
}
