/**
 * The captures screens as a person uses them, in Debian's chromium against the built server with
 * the demo seed: the list shows the demo captures, a capture page draws its quick look and
 * balance report, a raw file goes up through the upload panel (surviving a dropped connection),
 * and an operator sees another user's capture read-only.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserSuite, hasChromium, hydrated } from '../helpers/browser';

describe.skipIf(!hasChromium)('captures in a browser', { timeout: 120_000 }, () => {
  const suite = browserSuite();
  let files: string;

  beforeAll(() => {
    files = mkdtempSync(join(tmpdir(), 'quadrille-upload-'));
  });

  afterAll(() => {
    if (files) rmSync(files, { recursive: true, force: true });
  });

  const pageAs = (email: string) => suite.tabs.pageAs(email);

  /**
   * Fills an input and checks it holds exactly `text`. Call once the form carries `data-ready`
   * (React attached): typing into the server-rendered form before that could land after the default.
   */
  async function fillExactly(input: ReturnType<Page['locator']>, text: string): Promise<void> {
    await input.fill(text);
    expect(await input.inputValue()).toBe(text);
  }

  const rowNames = (page: Page) => page.locator('[data-testid="captures-table"] tbody tr[data-capture-id] td:nth-child(2) a').allTextContents();

  it('lists the demo captures with their rates and sizes', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await page.goto('/captures');
    const names = await rowNames(page);
    expect(names.filter((n) => n.startsWith('Saltmarsh'))).toHaveLength(4);
    const row = page.locator('tr', { hasText: 'Saltmarsh IF variant' });
    // 40 Msps real IF of 0.1 s as ri16_le: 4e6 samples x 2 bytes = 7.63 MiB (demo spec).
    expect(await row.textContent()).toContain('40 Msps');
    expect(await row.textContent()).toContain('7.63 MiB');
    expect(await page.getByTestId('storage-usage').textContent()).toMatch(/Your storage: .*MiB of .*GiB/);
  });

  it('opens a capture and shows its quick-look spectrum and balance report', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await page.goto('/captures');
    await page.getByRole('link', { name: 'Saltmarsh rev A: node beacon, bench 1' }).click();
    await page.waitForURL(/\/captures\/[^/]+$/);
    await page.locator('[data-testid="spectrum-plot"][data-plot-ready]').waitFor({ timeout: 90_000 });
    expect(await page.getByTestId('quick-look-label').textContent()).toMatch(/first 262,144 samples \(65\.54 ms\)/);
    const number = async (id: string) => Number((await page.getByTestId(id).getAttribute('data-quantity')) ?? (await page.getByTestId(id).locator('[data-quantity]').first().getAttribute('data-quantity')));
    // The demo's rev A front end has 0.3 dB gain and 2 deg phase imbalance (DESIGN.md, src/dsp/synth/demo.ts);
    // the blind estimate (Ellingson 2003) recovers them from the head within the noise.
    expect(Math.abs((await number('balance-gain')) - 0.3)).toBeLessThan(0.1);
    expect(Math.abs((await number('balance-phase')) - 2)).toBeLessThan(0.3);
    expect(await number('balance-irr')).toBeGreaterThan(25);
    expect(await page.getByTestId('balance-report').textContent()).toContain('Estimated from the first 262,144 samples');
    expect(await page.getByTestId('transmit-caution').textContent()).toMatch(/licence or authorisation/);
  });

  it('uploads a raw file through the upload panel, resuming after a dropped connection', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    // 65536 complex float32 samples (512 KiB) of a tone at fs/16.
    const samples = new Float32Array(2 * 65536);
    for (let n = 0; n < 65536; n++) {
      samples[2 * n] = 0.5 * Math.cos((2 * Math.PI * n) / 16);
      samples[2 * n + 1] = 0.5 * Math.sin((2 * Math.PI * n) / 16);
    }
    const path = join(files, 'bench-tone.cf32');
    writeFileSync(path, new Uint8Array(samples.buffer));
    writeFileSync(join(files, 'odd.cf32'), new Uint8Array(samples.buffer).subarray(0, 8 * 1000 + 3));

    let dropped = false;
    await page.route('**/api/uploads/**', async (route) => {
      if (!dropped && route.request().method() === 'PATCH') {
        dropped = true;
        return route.abort('connectionreset');
      }
      return route.continue();
    });
    await page.goto('/captures');
    await hydrated(page);
    const panel = page.getByTestId('upload-panel');

    // A byte count that is not a whole number of samples is refused beside the file, before sending.
    await panel.locator('input[type=file]').setInputFiles(join(files, 'odd.cf32'));
    await panel.getByLabel('Datatype').selectOption('cf32_le');
    await panel.getByLabel('Sample rate').fill('1M');
    await panel.getByRole('button', { name: 'Upload' }).click();
    expect(await panel.locator('[data-field-error="file"]').textContent()).toMatch(/not a whole number of 8-byte samples/);

    await panel.locator('input[type=file]').setInputFiles(path);
    await panel.getByLabel('Name').fill('Bench tone, raw upload');
    await panel.getByLabel('Datatype').selectOption('cf32_le');
    await panel.getByLabel('Sample rate').fill('1 MHz');
    await panel.getByLabel('Centre frequency (optional)').fill('2.412G');
    await panel.getByRole('button', { name: 'Upload' }).click();
    const done = page.getByTestId('upload-done');
    await done.waitFor({ timeout: 60_000 });
    expect(dropped).toBe(true);
    expect(await done.textContent()).toContain('Bench tone, raw upload');
    await expect.poll(() => rowNames(page), { timeout: 15_000 }).toContain('Bench tone, raw upload');

    const stored = await suite.server.db('captures').where({ name: 'Bench tone, raw upload' }).first();
    expect(Number(stored.byte_size)).toBe(samples.byteLength);
    expect(stored.sample_rate).toBe(1e6);
    expect(stored.center_frequency).toBe(2.412e9);
  });

  it('synthesizes a capture from the form, refusing a tone beyond Nyquist beside its field', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await page.goto('/captures/synthesize');
    await hydrated(page);
    await page.locator('[data-testid="synth-form"][data-ready]').waitFor();
    const form = page.getByTestId('synth-form');
    await fillExactly(form.getByLabel('Name').first(), 'Bench tone, synthesized');
    await fillExactly(form.getByLabel('Sample rate (Hz)'), '2M');
    await fillExactly(form.getByLabel('Frequency (Hz)', { exact: true }), '1.5 MHz');
    await form.getByRole('button', { name: 'Synthesize and store' }).click();
    // A complex capture at 2 Msps holds -1 MHz to +1 MHz (Nyquist): the engine's own check names the tone.
    expect(await form.locator('[data-field-error="tones.0.frequency"]').textContent()).toMatch(/outside -fs\/2 to fs\/2/);
    await form.getByLabel('Frequency (Hz)', { exact: true }).fill('250k');
    await form.getByRole('button', { name: 'Synthesize and store' }).click();
    await page.waitForURL((url) => /^\/captures\/[^/]+$/.test(url.pathname) && !url.pathname.endsWith('/synthesize'), { timeout: 60_000 });
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Bench tone, synthesized');
    expect(await page.getByTestId('capture-facts').textContent()).toContain('2 Msps');
    await page.locator('[data-testid="spectrum-plot"][data-plot-ready]').waitFor({ timeout: 90_000 });

    // The owner edits the description in place.
    await page.locator('form[data-ready][data-testid="metadata-form"]').waitFor();
    await page.getByLabel('Notes').fill('Reference tone for the bench.');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.getByText('Saved.').waitFor();
    const stored = await suite.server.db('captures').where({ name: 'Bench tone, synthesized' }).first();
    expect(stored.notes).toBe('Reference tone for the bench.');
    expect(stored.source).toBe('synthesized');
  });

  it("shows an operator another user's capture read-only", async () => {
    const page = await pageAs('operator@saltmarsh.test');
    await page.goto('/captures');
    await page.getByRole('link', { name: 'Saltmarsh rev B: node beacon, bench 1' }).click();
    await page.waitForURL(/\/captures\/[^/]+$/);
    await hydrated(page);
    await page.getByTestId('metadata-readonly').waitFor();
    expect(await page.getByTestId('metadata-form').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Delete…' }).count()).toBe(0);
    expect(await page.getByTestId('metadata-readonly').textContent()).toMatch(/only the owner \(.+\) or an admin/);
    // The server refuses the change too, whatever the page shows.
    const id = page.url().split('/').pop()!;
    const status = await page.evaluate(async (captureId) => {
      const response = await fetch(`/api/captures/${captureId}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'renamed' }) });
      return response.status;
    }, id);
    expect(status).toBe(403);
    // In the list, the operator can select and delete none of the engineer's captures.
    await page.goto('/captures');
    await hydrated(page);
    expect(await page.locator('[data-testid="captures-table"] tbody input[type=checkbox]:not([disabled])').count()).toBe(0);
  });
});
