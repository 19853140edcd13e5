/**
 * SigMF annotations edited on the capture page, in Debian's chromium against the built server
 * with the demo seed: the owner adds one with typed units, sees it listed and drawn, keeps it
 * across a reload, edits it, gets bad values refused beside their field with nothing saved,
 * marks one by dragging a box on the spectrogram, and deletes it; an operator only reads.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserSuite, hasChromium } from '../helpers/browser';

// Demo capture owned by the demo engineer: complex I/Q, 4 Msps for 0.25 s around 2.412 GHz (src/dsp/synth/demo.ts).
const captureName = 'Saltmarsh rev A: node beacon, bench 1';

describe.skipIf(!hasChromium)('capture annotations in a browser', { timeout: 180_000 }, () => {
  const suite = browserSuite();
  let captureId: string;

  beforeAll(async () => {
    captureId = (await suite.server.db('captures').where({ name: captureName }).first('id')).id;
    // The demo seed marks the beacon and the interferer; these steps start from an unmarked capture.
    await suite.server.db('captures').where({ id: captureId }).update({ annotations: '[]' });
  });

  const pageAs = (email: string) => suite.tabs.pageAs(email);

  /** Opens the capture page and waits until the spectrogram is drawn. */
  async function openCapture(page: Page): Promise<void> {
    await page.goto(`/captures/${captureId}`);
    await page.locator('[data-testid="spectrogram-plot"][data-plot-ready]').waitFor({ timeout: 90_000 });
  }

  const count = async (page: Page) => (await page.getByTestId('annotations-count').textContent())?.trim();
  const stored = async () => JSON.parse((await suite.server.db('captures').where({ id: captureId }).first('annotations')).annotations ?? '[]');
  /** The dotted boxes Plotly draws on the spectrogram (layout shapes), in axis units (MHz, ms). */
  const boxes = (page: Page) =>
    page.evaluate(() => {
      const graph = document.querySelector('[data-testid="spectrogram-plot"] .js-plotly-plot') as unknown as { layout: { shapes?: { x0: number; x1: number }[] } };
      return (graph.layout.shapes ?? []).map((s) => ({ x0: s.x0, x1: s.x1 }));
    });

  it('adds an annotation typed with units, lists and draws it, and keeps it across a reload', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await openCapture(page);
    expect(await count(page)).toBe('(0)');
    await page.getByRole('button', { name: 'Add annotation' }).click();
    const form = page.getByTestId('annotation-form');
    await form.getByLabel('Label').fill('Beacon burst');
    await form.getByLabel('Start').fill('12.5 ms');
    await form.getByLabel('Duration').fill('2 ms');
    // The start's hint says which sample the time lands on: 12.5 ms x 4 Msps.
    expect(await form.textContent()).toContain('= sample 50,000');
    expect(await form.textContent()).toContain('= 8,000 samples');
    await form.getByLabel('Lower edge').fill('2.4121 GHz');
    await form.getByLabel('Upper edge').fill('2413.1 MHz');
    await form.getByLabel('Comment').fill('First beacon after power-up.');
    await form.getByRole('button', { name: 'Save annotation' }).click();

    await expect.poll(() => count(page)).toBe('(1)');
    expect(await form.count()).toBe(0);
    const item = page.getByTestId('annotation-item');
    expect(await item.textContent()).toMatch(/Beacon burst.*from 12\.5 ms for 2 ms.*2\.4121 GHz to 2\.4131 GHz.*First beacon after power-up\./);
    // Stored as SigMF core fields in samples and Hz (SigMF specification v1.2.0, annotation segment objects; from memory).
    expect(await stored()).toEqual([
      {
        'core:sample_start': 50_000,
        'core:sample_count': 8_000,
        'core:freq_lower_edge': 2.4121e9,
        'core:freq_upper_edge': 2.4131e9,
        'core:label': 'Beacon burst',
        'core:comment': 'First beacon after power-up.',
      },
    ]);
    // Drawn at once on the spectrogram, whose frequency axis reads MHz of RF.
    expect(await boxes(page)).toEqual([{ x0: 2412.1, x1: 2413.1 }]);

    await page.reload();
    await page.locator('[data-testid="spectrogram-plot"][data-plot-ready]').waitFor({ timeout: 90_000 });
    expect(await count(page)).toBe('(1)');
    expect(await page.getByTestId('annotation-item').textContent()).toContain('Beacon burst');
  });

  it('edits the annotation, and refuses bad values beside their field without saving', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await openCapture(page);
    let patches = 0;
    page.on('request', (request) => {
      if (request.method() === 'PATCH' && request.url().includes('/api/captures/')) patches += 1;
    });
    await page.getByRole('button', { name: 'Edit Beacon burst' }).click();
    const form = page.getByTestId('annotation-form');
    expect(await form.getByLabel('Start').inputValue()).toBe('12.5 ms');
    expect(await form.getByLabel('Lower edge').inputValue()).toBe('2.4121 GHz');
    await form.getByLabel('Label').fill('Beacon burst, long');
    await form.getByLabel('Duration').fill('12000');
    await form.getByRole('button', { name: 'Save annotation' }).click();
    await expect.poll(async () => (await stored())[0]?.['core:label']).toBe('Beacon burst, long');
    expect((await stored())[0]['core:sample_count']).toBe(12_000);
    // 12000 samples at 4 Msps = 3 ms.
    await expect.poll(() => page.getByTestId('annotation-item').textContent()).toMatch(/Beacon burst, long.*for 3 ms/);
    expect(patches).toBe(1);

    const before = await stored();
    await page.getByRole('button', { name: 'Edit Beacon burst, long' }).click();
    await form.getByLabel('Upper edge').fill('2.4 GHz');
    await form.getByLabel('Start').fill('300 ms');
    await form.getByRole('button', { name: 'Save annotation' }).click();
    expect(await form.locator('[data-field-error="upperEdge"]').textContent()).toBe('Upper edge 2.4 GHz is below the lower edge 2.4121 GHz.');
    // The capture holds 0.25 s (1,000,000 samples at 4 Msps).
    expect(await form.locator('[data-field-error="start"]').textContent()).toMatch(/past the end of the capture \(250 ms, 1,000,000 samples\)/);
    expect(patches).toBe(1);
    expect(await stored()).toEqual(before);

    // A refusal only the server can make lands on its field too (its field name mapped back).
    await form.getByLabel('Upper edge').fill('2.4131 GHz');
    await form.getByLabel('Start').fill('12.5 ms');
    await page.route('**/api/captures/*', (route) =>
      route.request().method() === 'PATCH'
        ? route.fulfill({
            status: 422,
            contentType: 'application/json',
            body: JSON.stringify({ error: { code: 'invalid_field', message: "annotations[0].core:sample_count: the annotation reaches past the capture's 1000000 samples.", field: 'annotations[0].core:sample_count' } }),
          })
        : route.continue(),
    );
    await form.getByRole('button', { name: 'Save annotation' }).click();
    expect(await form.locator('[data-field-error="duration"]').textContent()).toBe("The annotation reaches past the capture's 1000000 samples.");
    expect(await stored()).toEqual(before);
    await page.unroute('**/api/captures/*');
    await form.getByRole('button', { name: 'Cancel' }).click();
    expect(await form.count()).toBe(0);
  });

  it('pre-fills a new annotation from a box dragged on the spectrogram', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await openCapture(page);
    const area = await page.locator('[data-testid="spectrogram-plot"] .nsewdrag').first().boundingBox();
    expect(area).not.toBeNull();
    const { x, y, width, height } = area!;
    await page.mouse.move(x + width * 0.6, y + height * 0.2);
    await page.mouse.down();
    await page.mouse.move(x + width * 0.7, y + height * 0.35, { steps: 8 });
    await page.mouse.move(x + width * 0.75, y + height * 0.5, { steps: 8 });
    await page.mouse.up();
    const form = page.getByTestId('annotation-form');
    await form.waitFor();
    // What Plotly reports for the box, in axis units: MHz of RF across, ms from the start up.
    const box = await page.evaluate(() => {
      const graph = document.querySelector('[data-testid="spectrogram-plot"] .js-plotly-plot') as unknown as { layout: { selections: { x0: number; x1: number; y0: number; y1: number }[] } };
      return graph.layout.selections[0];
    });
    const hz = (text: string) => Number(text.replace(' GHz', '')) * 1e9;
    const ms = (text: string) => Number(text.replace(' ms', ''));
    // Pre-filled values are the box rounded to a thousandth of the plotted span (4 kHz -> 1 kHz, 65.5 ms -> 10 us).
    expect(Math.abs(hz(await form.getByLabel('Lower edge').inputValue()) - Math.min(box.x0, box.x1) * 1e6)).toBeLessThanOrEqual(500);
    expect(Math.abs(hz(await form.getByLabel('Upper edge').inputValue()) - Math.max(box.x0, box.x1) * 1e6)).toBeLessThanOrEqual(500);
    const start = ms(await form.getByLabel('Start').inputValue());
    expect(Math.abs(start - Math.min(box.y0, box.y1))).toBeLessThanOrEqual(0.005);
    expect(Math.abs(start + ms(await form.getByLabel('Duration').inputValue()) - Math.max(box.y0, box.y1))).toBeLessThanOrEqual(0.01);

    await form.getByLabel('Label').fill('Interferer check');
    await form.getByRole('button', { name: 'Save annotation' }).click();
    await expect.poll(() => count(page)).toBe('(2)');
    expect(await boxes(page)).toHaveLength(2);
    expect((await stored()).map((a: Record<string, unknown>) => a['core:label'])).toContain('Interferer check');
  });

  it('deletes an annotation after confirmation', async () => {
    const page = await pageAs('engineer@saltmarsh.test');
    await openCapture(page);
    expect(await count(page)).toBe('(2)');
    await page.getByRole('button', { name: 'Delete Interferer check' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Delete annotation' }).click();
    await expect.poll(() => count(page)).toBe('(1)');
    expect((await stored()).map((a: Record<string, unknown>) => a['core:label'])).toEqual(['Beacon burst, long']);
    expect(await boxes(page)).toHaveLength(1);
  });

  it('shows an operator the annotations without edit controls', async () => {
    const page = await pageAs('operator@saltmarsh.test');
    await openCapture(page);
    expect(await count(page)).toBe('(1)');
    expect(await page.getByTestId('annotation-item').textContent()).toContain('Beacon burst, long');
    expect(await page.getByRole('button', { name: 'Add annotation' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^(Edit|Delete) / }).count()).toBe(0);
    expect(await page.getByTestId('marking-hint').count()).toBe(0);
    // The spectrogram keeps zoom for readers: a drag opens no form.
    const area = (await page.locator('[data-testid="spectrogram-plot"] .nsewdrag').first().boundingBox())!;
    await page.mouse.move(area.x + area.width * 0.3, area.y + area.height * 0.3);
    await page.mouse.down();
    await page.mouse.move(area.x + area.width * 0.5, area.y + area.height * 0.5, { steps: 8 });
    await page.mouse.up();
    expect(await page.getByTestId('annotation-form').count()).toBe(0);
  });
});
