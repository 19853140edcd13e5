/**
 * The captures, runs and chains lists keep their search, filters, sort and page in the URL, in Debian's
 * chromium against the built server: a reload and Back from a detail page come back to the same
 * rows, Back steps through pages, and a hand-made bad link shows the default list.
 *
 * Set QUADRILLE_SHOTS_DIR to also save screenshots of both lists at 1280 px, light and dark.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { Client } from '../helpers/client';
import { browserSuite, hasChromium, hydrated as islandsHydrated, shoot as shootPage } from '../helpers/browser';
import { blindIqChain, complexTone, createChain, finished, quickChain, signedIn, submitRun, synthCapture, uploadCapture, waitForRun } from '../api/runs-helpers';

// Twelve 40 Msps cf32 captures whose size grows with their number, so "largest first" is known.
const SWEEPS = 12;
const sweepName = (n: number) => `Beacon sweep ${String(n).padStart(2, '0')}`;
// One real run, then repeats answered from the result cache: more succeeded runs than a page holds.
const CACHED_REPEATS = 26;

describe.skipIf(!hasChromium)('list state in the URL', { timeout: 180_000 }, () => {
  const suite = browserSuite();
  let page: Page;
  let engineer: Client;

  beforeAll(async () => {
    engineer = await signedIn(suite.server.baseUrl, 'engineer@saltmarsh.test');
    for (let n = 1; n <= SWEEPS; n++) await uploadCapture(engineer, sweepName(n), complexTone(256 * n, 40e6, 1e6, { seed: n }), 40e6);

    const capture = await synthCapture(engineer, 'List check tone', 0.01);
    const chain = await createChain(engineer, quickChain());
    const first = await submitRun(engineer, chain, capture);
    expect((await waitForRun(engineer, first.id, finished)).status).toBe('succeeded');
    for (let n = 0; n < CACHED_REPEATS; n++) expect((await submitRun(engineer, chain, capture)).fromCache).toBe(true);
    const sameIq = await uploadCapture(engineer, 'List check I equals Q', complexTone(20_000, 4e6, 300_000, { sameIq: true }), 4e6);
    const failing = await submitRun(engineer, await createChain(engineer, blindIqChain()), sameIq);
    expect((await waitForRun(engineer, failing.id, finished)).status).toBe('failed');

    page = await suite.tabs.open({ session: engineer });
  }, 120_000);

  const hydrated = () => islandsHydrated(page);

  /** The query string of the page, parsed, for comparing without caring about order or encoding. */
  const query = () => Object.fromEntries(new URL(page.url()).searchParams);

  /** Screenshots at 1280 px, light and dark (only with QUADRILLE_SHOTS_DIR). */
  const shoot = (name: string) => shootPage(page, name);

  describe('captures', () => {
    const table = () => page.getByTestId('captures-table');
    const names = () => page.locator('[data-testid="captures-table"] tbody tr[data-capture-id] td:nth-child(2) a').allTextContents();
    /** Row names once no list request is in flight. */
    async function settledNames(): Promise<string[]> {
      await page.locator('[data-testid="captures-table"]:not([data-loading])').waitFor();
      return names();
    }
    const expectedPage2 = [sweepName(2), sweepName(1)];

    it('puts search, datatype, rate, sort, page size and page in the URL', async () => {
      await page.goto('/captures');
      await hydrated();
      const entries = await page.evaluate(() => history.length);
      await table().getByLabel('Search').pressSequentially('sweep');
      await page.waitForURL((url) => url.searchParams.get('q') === 'sweep');
      // Typing rewrites the current history entry instead of adding one per keystroke.
      expect(await page.evaluate(() => history.length)).toBe(entries);

      await table().getByLabel('Datatype').selectOption('cf32_le');
      await table().getByLabel('Rate from').fill('40M');
      await page.waitForURL((url) => url.searchParams.get('rate_min') === '40M');
      await table().getByRole('button', { name: /^Size/ }).click();
      if (query().sort !== '-size') await table().getByRole('button', { name: /^Size/ }).click();
      await page.waitForURL((url) => url.searchParams.get('sort') === '-size');
      await page.getByRole('navigation', { name: 'Pages of captures' }).getByLabel('Per page').selectOption('10');
      await page.waitForURL((url) => url.searchParams.get('per_page') === '10');
      expect(await settledNames()).toEqual(Array.from({ length: 10 }, (_, i) => sweepName(SWEEPS - i)));

      await page.getByRole('navigation', { name: 'Pages of captures' }).getByRole('button', { name: 'Next' }).click();
      await page.waitForURL((url) => url.searchParams.get('page') === '2');
      await expect.poll(settledNames).toEqual(expectedPage2);
      expect(query()).toEqual({ q: 'sweep', datatype: 'cf32_le', rate_min: '40M', sort: '-size', page: '2', per_page: '10' });
      await shoot('captures-list-state');
    });

    it('shows the same filters and rows after a reload', async () => {
      const before = page.url();
      await page.reload();
      await hydrated();
      expect(page.url()).toBe(before);
      expect(await names()).toEqual(expectedPage2);
      expect(await table().getByLabel('Search').inputValue()).toBe('sweep');
      expect(await table().getByLabel('Datatype').inputValue()).toBe('cf32_le');
      expect(await table().getByLabel('Rate from').inputValue()).toBe('40M');
      expect(await table().locator('th[aria-sort]', { hasText: 'Size' }).getAttribute('aria-sort')).toBe('descending');
    });

    it('comes back to the same list page from a capture', async () => {
      const before = page.url();
      await table().getByRole('link', { name: sweepName(2) }).click();
      await page.waitForURL(/\/captures\/[^/?]+$/);
      await page.goBack();
      await page.waitForURL(before);
      await hydrated();
      await expect.poll(settledNames).toEqual(expectedPage2);
      expect(await table().getByLabel('Search').inputValue()).toBe('sweep');
    });

    it('steps back through pages with the Back button', async () => {
      await page.goBack();
      await page.waitForURL((url) => url.searchParams.get('page') === null && url.searchParams.get('per_page') === '10');
      await expect.poll(settledNames).toEqual(Array.from({ length: 10 }, (_, i) => sweepName(SWEEPS - i)));
      await page.goForward();
      await page.waitForURL((url) => url.searchParams.get('page') === '2');
      await expect.poll(settledNames).toEqual(expectedPage2);
    });

    it('a filter change goes back to page 1', async () => {
      await table().getByLabel('Owner').selectOption('me');
      await page.waitForURL((url) => url.searchParams.get('owner') === 'me');
      expect(query().page).toBeUndefined();
      await expect.poll(settledNames).toHaveLength(10);
    });

    it('shows the default list for a hand-made bad link', async () => {
      await page.goto('/captures');
      await hydrated();
      const defaults = await names();
      expect(defaults.length).toBeGreaterThan(SWEEPS);
      await page.goto('/captures?page=abc&sort=nonsense&per_page=7&datatype=cf99');
      await hydrated();
      expect(await names()).toEqual(defaults);
      expect(await page.getByRole('alert').count()).toBe(0);
      // The address is rewritten to the list it shows.
      await page.waitForURL((url) => url.pathname === '/captures' && url.search === '');
    });
  });

  describe('runs', () => {
    const table = () => page.getByTestId('runs-table');
    const pager = () => page.getByRole('navigation', { name: 'Pages of runs' });
    const rows = () => page.locator('[data-testid="runs-table"] tbody tr[data-run-id]');
    const statuses = () => rows().evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-status')));
    const succeededPage2 = new Array(CACHED_REPEATS + 1 - 25).fill('succeeded');

    it('puts the status filter and page in the URL', async () => {
      await page.goto('/runs');
      await hydrated();
      await expect.poll(() => rows().count()).toBe(CACHED_REPEATS + 2);
      await table().getByLabel('Show').selectOption('failed');
      await page.waitForURL((url) => url.searchParams.get('status') === 'failed');
      await expect.poll(statuses).toEqual(['failed']);

      await table().getByLabel('Show').selectOption('succeeded');
      await pager().getByLabel('Per page').selectOption('25');
      await page.waitForURL((url) => url.searchParams.get('per_page') === '25');
      await expect.poll(statuses).toEqual(new Array(25).fill('succeeded'));
      await pager().getByRole('button', { name: 'Next' }).click();
      await page.waitForURL((url) => url.searchParams.get('page') === '2');
      await expect.poll(statuses).toEqual(succeededPage2);
      expect(query()).toEqual({ status: 'succeeded', page: '2', per_page: '25' });
      await shoot('runs-list-state');
    });

    it('shows the same runs after a reload and after Back from a run', async () => {
      const before = page.url();
      const ids = await rows().evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-run-id')));
      await page.reload();
      await hydrated();
      expect(page.url()).toBe(before);
      expect(await rows().evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-run-id')))).toEqual(ids);
      expect(await table().getByLabel('Show').inputValue()).toBe('succeeded');

      await rows().first().getByRole('link', { name: 'Beacon down-conversion' }).click();
      await page.waitForURL(/\/runs\/[^/?]+$/);
      await page.goBack();
      await page.waitForURL(before);
      await hydrated();
      await expect.poll(() => rows().evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-run-id')))).toEqual(ids);

      // Back once more: the first page of the same filter.
      await page.goBack();
      await page.waitForURL((url) => url.searchParams.get('page') === null && url.searchParams.get('status') === 'succeeded');
      await expect.poll(statuses).toEqual(new Array(25).fill('succeeded'));
    });

    it('shows the default list for a hand-made bad link', async () => {
      await page.goto('/runs?page=abc&status=nonsense&per_page=7&all=1');
      await hydrated();
      await expect.poll(() => rows().count()).toBe(CACHED_REPEATS + 2);
      expect(await table().getByLabel('Show').inputValue()).toBe('');
      expect(await page.getByRole('alert').count()).toBe(0);
      await page.waitForURL((url) => url.pathname === '/runs' && url.search === '');
    });
  });
  describe('chains', () => {
    // Names whose case differs, so the name sort is seen to ignore case.
    const chainNames = Array.from({ length: 12 }, (_, i) => `${i % 2 ? 'listed' : 'Listed'} chain ${String(i + 1).padStart(2, '0')}`);
    const table = () => page.getByTestId('chains-table');
    async function settledNames(): Promise<string[]> {
      await page.locator('[data-testid="chains-table"]:not([data-loading])').waitFor();
      return page.locator('[data-testid="chains-table"] tbody tr[data-chain] td:first-child a').allTextContents();
    }

    beforeAll(async () => {
      for (const name of chainNames) await createChain(engineer, { ...quickChain(), name });
    });

    it('puts search, sort, page size and page in the URL, and a reload shows the same rows', async () => {
      await page.goto('/chains');
      await hydrated();
      await table().getByLabel('Search chains').pressSequentially('listed chain');
      await page.waitForURL((url) => url.searchParams.get('q') === 'listed chain');
      await table().getByRole('button', { name: /^Name/ }).click();
      await page.waitForURL((url) => url.searchParams.get('sort') !== null && url.searchParams.get('sort')!.endsWith('name'));
      if (query().sort !== 'name') {
        await table().getByRole('button', { name: /^Name/ }).click();
        await page.waitForURL((url) => url.searchParams.get('sort') === 'name');
      }
      await page.getByRole('navigation', { name: 'Pages of chains' }).getByLabel('Per page').selectOption('10');
      await page.waitForURL((url) => url.searchParams.get('per_page') === '10');
      expect(await settledNames()).toEqual(chainNames.slice(0, 10));
      await page.getByRole('navigation', { name: 'Pages of chains' }).getByRole('button', { name: 'Next' }).click();
      await page.waitForURL((url) => url.searchParams.get('page') === '2');
      await expect.poll(settledNames).toEqual(chainNames.slice(10));

      await page.reload();
      await hydrated();
      expect(query()).toEqual({ q: 'listed chain', sort: 'name', per_page: '10', page: '2' });
      expect(await settledNames()).toEqual(chainNames.slice(10));
      await shoot('chains-list');
    });

    it('steps back to the first page with Back', async () => {
      await page.goBack();
      await page.waitForURL((url) => url.searchParams.get('page') === null);
      await expect.poll(settledNames).toEqual(chainNames.slice(0, 10));
    });

    it('shows the default list for a hand-made bad link', async () => {
      await page.goto('/chains?sort=colour&page=-3&per_page=7');
      await hydrated();
      expect(await page.getByRole('alert').count()).toBe(0);
      // Newest change first: the chain made last leads.
      expect((await settledNames())[0]).toBe(chainNames.at(-1));
    });
  });
});
