import { describe, expect, it } from 'vitest';
import { buildSearch, pageNumber, pageSizeFrom, sortFrom, sortText } from '@/components/table/url-state';
import {
  captureListCodec,
  captureListParams,
  defaultCaptureListState,
  emptyFilters,
  parseCaptureListState,
  serializeCaptureListState,
  type CaptureListState,
} from '@/components/captures/list-state';
import { defaultRunListState, runListCodec, runListParams } from '@/components/runs/list-state';

describe('list URL readers', () => {
  it('reads whole page numbers from 1 and falls back to page 1 on anything else', () => {
    expect(pageNumber('2')).toBe(2);
    expect(pageNumber('100000')).toBe(100_000);
    for (const bad of [null, '', 'abc', '0', '-1', '1.5', '2e3', ' 2', '100001', '9999999']) expect(pageNumber(bad), String(bad)).toBe(1);
  });

  it('takes only the offered page sizes', () => {
    expect(pageSizeFrom('50', [25, 50], 25)).toBe(50);
    for (const bad of [null, '49', 'x', '5000', '-25']) expect(pageSizeFrom(bad, [25, 50], 25)).toBe(25);
  });

  it('reads a sort word with a leading minus as descending, and writes it back', () => {
    const names = { size: 'byteSize', name: 'name' } as const;
    const fallback = { key: 'name' as const, desc: false };
    expect(sortFrom('-size', names, fallback)).toEqual({ key: 'byteSize', desc: true });
    expect(sortFrom('size', names, fallback)).toEqual({ key: 'byteSize', desc: false });
    for (const bad of [null, '', 'nonsense', '-', '--size', 'toString', '__proto__']) expect(sortFrom(bad, names, fallback)).toEqual(fallback);
    expect(sortText('byteSize', true, names)).toBe('-size');
  });

  it('leaves out empty values and defaults, and keeps commas readable', () => {
    expect(buildSearch([['a', ''], ['b', undefined], ['page', 1, 1], ['status', 'queued,running']])).toBe('status=queued,running');
    expect(buildSearch([['q', 'rev a&b']])).toBe('q=rev+a%26b');
  });
});

describe('captures list state in the URL', () => {
  const bookmarked: CaptureListState = {
    filters: { ...emptyFilters, q: 'beacon', owner: 'me', datatype: 'cf32_le', minRate: '40M', maxRate: '50 Msps', layout: 'complex', tag: 'rev-a' },
    sort: 'byteSize',
    desc: true,
    page: 2,
    pageSize: 10,
  };

  it('writes short readable names and reads back the same state', () => {
    const search = serializeCaptureListState(bookmarked);
    expect(search).toBe('q=beacon&owner=me&tag=rev-a&layout=complex&datatype=cf32_le&rate_min=40M&rate_max=50+Msps&sort=-size&page=2&per_page=10');
    expect(parseCaptureListState(`?${search}`)).toEqual(bookmarked);
  });

  it('writes nothing for the default list and reads an empty query as the default', () => {
    expect(serializeCaptureListState(defaultCaptureListState)).toBe('');
    expect(captureListCodec.parse('')).toEqual(defaultCaptureListState);
  });

  it('falls back to defaults for values it does not know, keeping the good ones', () => {
    const state = parseCaptureListState('?page=abc&sort=nonsense&per_page=7&owner=somebody&layout=square&datatype=cf99&rate_min=fast&q=beacon');
    expect(state).toEqual({ ...defaultCaptureListState, filters: { ...emptyFilters, q: 'beacon' } });
  });

  it('leaves out a rate bound it cannot read, as the list request does', () => {
    const state = { ...defaultCaptureListState, filters: { ...emptyFilters, minRate: '4 MHz', maxRate: 'lots' } };
    expect(serializeCaptureListState(state)).toBe('rate_min=4+MHz');
    // 4 MHz is 4e6 Hz: SI prefix M = 10^6 (BIPM, "The International System of Units (SI)", 9th edition, 2019, Table 7).
    expect(captureListParams(state)).toMatchObject({ minRate: 4e6, maxRate: undefined });
  });

  it('turns the state into the list endpoint parameters', () => {
    expect(captureListParams(bookmarked)).toEqual({
      q: 'beacon',
      owner: 'me',
      tag: 'rev-a',
      layout: 'complex',
      datatype: 'cf32_le',
      minRate: 40e6,
      maxRate: 50e6,
      sort: 'byteSize',
      order: 'desc',
      page: 2,
      pageSize: 10,
    });
  });
});

describe('runs list state in the URL', () => {
  it('writes the status filter, queue switch and page and reads them back', () => {
    const codec = runListCodec(true);
    const state = { status: 'queued,running', all: true, page: 3, pageSize: 25 };
    expect(codec.serialize(state)).toBe('status=queued,running&all=1&page=3&per_page=25');
    expect(codec.parse('?status=running,queued&all=1&page=3&per_page=25')).toEqual(state);
    expect(codec.serialize(defaultRunListState)).toBe('');
  });

  it('drops the whole-queue switch for viewers who may not see the queue', () => {
    const codec = runListCodec(false);
    expect(codec.parse('?all=1&status=failed')).toEqual({ ...defaultRunListState, status: 'failed' });
    expect(codec.serialize({ ...defaultRunListState, all: true })).toBe('');
  });

  it('falls back to every status and page 1 on values it does not know', () => {
    const codec = runListCodec(true);
    for (const search of ['?status=done&page=abc', '?status=failed,bogus&page=0', '?status=queued,failed&all=yes&per_page=51']) {
      expect(codec.parse(search), search).toEqual(defaultRunListState);
    }
    expect(runListParams({ ...defaultRunListState, status: 'failed' })).toEqual({ all: false, status: 'failed', page: 1, pageSize: 50 });
  });
});
