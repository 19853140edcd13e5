/**
 * Runs as an operator uses them, in Debian's chromium against the built server with the demo data
 * and one run at a time: rerun the demo "Front-end balance check" chain on the rev A and rev B
 * captures from the chain page, watch both finish on the runs list, read one run's spectrum,
 * markers and readouts, then compare the two.
 *
 * Set QUADRILLE_SHOTS_DIR to also save screenshots of each screen at 1280 and 2560 px, light and dark.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserSuite, hasChromium, pageErrorsOf, shoot as shootPage, signInWithForm } from '../helpers/browser';

const chainName = 'Front-end balance check';
const revA = /Saltmarsh rev A/;
const revB = /Saltmarsh rev B/;

// Runs on a loaded two-core machine take seconds each; the whole flow gets a few minutes.
describe.skipIf(!hasChromium)('runs in a browser', { timeout: 180_000 }, () => {
  const suite = browserSuite({ env: { QUADRILLE_RUN_CONCURRENCY: '1' } });
  let page: Page;
  let runIds: string[] = [];

  beforeAll(async () => {
    page = await suite.tabs.open({ acceptDownloads: true });
  });

  /** Screenshots of the page as it is at 1280 and 2560 px, light and dark (only with QUADRILLE_SHOTS_DIR); plots resize and re-theme on the next frames. */
  const shoot = (name: string) => shootPage(page, name, { widths: [1280, 2560], settleMs: 800 });

  it('signs the operator in', async () => {
    await signInWithForm(page, 'operator@saltmarsh.test');
    await page.waitForURL(suite.server.baseUrl + '/');
  });

  it('reruns the demo chain on the rev A and rev B captures from the chain page', async () => {
    const chain = await suite.server.db('chains').where({ name: chainName }).first('id');
    expect(chain, 'the demo chain is seeded').toBeTruthy();
    await page.goto(`/chains/${chain.id}`);
    await page.getByTestId('run-on-captures').click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('checkbox', { name: revA }).check();
    await dialog.getByRole('checkbox', { name: revB }).check();
    await shoot('dialog-run-on-captures');
    await dialog.getByTestId('run-dialog-submit').click();
    await page.waitForURL(suite.server.baseUrl + '/runs');
  });

  it('shows both runs finish on the runs list', async () => {
    const rows = page.locator('tr[data-run-id]');
    await expect.poll(() => rows.count()).toBe(2);
    await expect.poll(() => page.locator('tr[data-run-id][data-status="succeeded"]').count(), { timeout: 120_000, interval: 500 }).toBe(2);
    runIds = await rows.evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-run-id')!));
    const text = await page.getByTestId('runs-table').textContent();
    expect(text).toContain(chainName);
    expect(text).toMatch(revA);
    expect(text).toMatch(revB);
    // Finished runs show a full bar.
    expect(await page.locator('tr[data-run-id] [role="progressbar"]').evaluateAll((bars) => bars.map((b) => b.getAttribute('aria-valuenow')))).toEqual([
      '100',
      '100',
    ]);
    // The list rendered on the server while runs were queued and running hydrates without a
    // mismatch (a time-so-far computed from two different clocks once did not).
    expect(pageErrorsOf(page)).toEqual([]);
    await shoot('runs-list');
  });

  it('opens the rev A run and shows its spectrum, markers and readouts', async () => {
    // The chain name in a row opens that run.
    await page.locator('tr[data-run-id]', { hasText: revA }).getByRole('link', { name: chainName }).click();
    await page.waitForURL(/\/runs\/[^/]+$/);
    const plot = page.locator('[data-testid="spectrum-plot-band-spectrum"][data-plot-ready]');
    await plot.waitFor({ timeout: 60_000 });
    // The reduced trace never has more points than the plot is wide.
    const points = await plot.evaluate((figure) => {
      const graph = figure.querySelector('.js-plotly-plot') as unknown as { data: { x: number[] }[]; clientWidth: number };
      return { points: graph.data[0]!.x.length, width: graph.clientWidth };
    });
    expect(points.points).toBeGreaterThan(100);
    expect(points.points).toBeLessThanOrEqual(points.width);

    const readouts = page.getByTestId('readouts-table');
    await readouts.waitFor();
    const phase = await readouts.locator('tr', { hasText: 'I/Q phase imbalance' }).textContent();
    // Rev A was synthesized with about 2 degrees of phase imbalance (the demo scenario).
    expect(phase).toMatch(/\d/);

    // Marker A on the peak, marker B by a click on the plot; the difference row fills in.
    const panel = page.getByTestId('marker-panel');
    await panel.locator('tr[data-marker="A"]').getByRole('button', { name: 'Peak' }).click();
    await expect.poll(() => page.getByTestId('marker-A-frequency').textContent()).toMatch(/Hz/);
    const area = await plot.locator('.nsewdrag').boundingBox();
    expect(area).not.toBeNull();
    await page.mouse.click(area!.x + area!.width * 0.25, area!.y + area!.height * 0.5);
    await expect.poll(() => page.getByTestId('marker-B-frequency').textContent()).toMatch(/Hz/);
    expect(await page.getByTestId('marker-difference').textContent()).toMatch(/ΔF.*Hz.*ΔL.*dB/);

    // PNG of the plot as drawn.
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('spectrum-card-band-spectrum').getByRole('button', { name: 'PNG', exact: true }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/spectrum-band-spectrum\.png$/);
    const png = readFileSync((await download.path())!);
    expect([...png.subarray(0, 4)]).toEqual([0x89, 0x50, 0x4e, 0x47]);

    // results.json from the export link parses and names the probes.
    const href = await page.getByTestId('run-exports').getByRole('link', { name: 'results.json' }).getAttribute('href');
    const results = await (await page.request.get(href!)).json();
    expect(results.probes.map((p: { stageId: string }) => p.stageId)).toEqual(['band-spectrum', 'balance']);
    await shoot('run-page');
  });

  it('compares the two runs: both spectra overlaid and the readout differences', async () => {
    await page.goto('/runs');
    for (const name of [revA, revB]) await page.locator('tr[data-run-id]', { hasText: name }).getByRole('checkbox').check();
    await page.getByTestId('compare-selected').click();
    await page.waitForURL(/\/runs\/compare\?ids=/);
    const plot = page.locator('[data-testid="compare-plot-band-spectrum"][data-plot-ready]');
    await plot.waitFor({ timeout: 60_000 });
    const names = await plot.evaluate((figure) =>
      (figure.querySelector('.js-plotly-plot') as unknown as { data: { name: string }[] }).data.map((trace) => trace.name),
    );
    expect(names).toHaveLength(2);
    expect(names.some((name) => revA.test(name))).toBe(true);
    expect(names.some((name) => revB.test(name))).toBe(true);
    expect(names.every((name) => name.includes('r1'))).toBe(true);

    const table = page.getByTestId('compare-readouts');
    const phaseRow = table.locator('tr', { hasText: 'I/Q phase imbalance' });
    expect(await phaseRow.locator('td').count()).toBe(4);
    expect(await phaseRow.textContent()).toMatch(/[+-]\d/);
    // Rev B fixes most of rev A's imbalance, so at least one difference stands out.
    expect(await table.locator('[data-large-difference]').count()).toBeGreaterThan(0);
    expect(new Set(runIds).size).toBe(2);
    await shoot('compare');
  });

  it('runs a chosen chain from a capture page and follows it to its result', async () => {
    const capture = await suite.server.db('captures').where('name', 'like', 'Saltmarsh rev B%').first('id');
    await page.goto(`/captures/${capture.id}`);
    await page.getByTestId('run-chain').click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('radio', { name: /Beacon down-conversion/ }).check();
    // The revision list fills in and the revision is checked against the capture before the button allows a run.
    await expect.poll(() => dialog.getByTestId('run-dialog-submit').isEnabled()).toBe(true);
    await shoot('dialog-run-chain');
    await dialog.getByTestId('run-dialog-submit').click();
    await page.waitForURL(/\/runs\/[^/]+$/);
    // The page follows the run live until it succeeds, then shows the baseband spectrum.
    await page.locator('[data-testid="run-status"][data-status="succeeded"]').waitFor({ timeout: 120_000 });
    await page.locator('[data-testid="spectrum-plot-baseband-spectrum"][data-plot-ready]').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('readouts-table').textContent()).toContain('Occupied bandwidth (99 %)');
  });
});
