/**
 * `npm run bench` (page weight): what a new user's browser downloads and waits for.
 *
 * 1. JavaScript bytes of the chain page, the capture page and a run page (a demo chain run on a
 *    demo capture): every script response of the page until it settles (network idle and its plots
 *    drawn), summed raw (decoded) and over the wire (as encoded by the server).
 * 2. Click to first plot: from a click on a capture in the captures list to the capture page's first
 *    drawn plot; click to readouts: from a click on a chain in the chains list to its readouts shown.
 *    Each in a fresh browser context (empty cache), --repeat N times (default 5): median, min, max.
 * 3. The largest JSON answers those pages received, raw and over the wire.
 *
 * Needs a build (`npm run build`) and Debian's chromium; QUADRILLE_TEST_DIST picks another build folder;
 * QUADRILLE_SHOTS_DIR saves a screenshot of each page. Option: --repeat N.
 */
import { type Browser, type BrowserContext, type Page, type Response } from 'playwright-core';
import { Client } from '../helpers/client';
import { launchHeadlessChromium } from '../helpers/chromium';
import { demoPassword } from '../../src/lib/server/seed';
import { sleep, startRunsServer } from '../api/runs-server';

const args = process.argv.slice(2);
const repeatAt = args.indexOf('--repeat');
const repeat = repeatAt >= 0 ? Number(args[repeatAt + 1]) : 5;

const engineer = 'engineer@saltmarsh.test';
const demoCapture = 'Saltmarsh rev A: node beacon, bench 1';
const demoChain = 'Beacon down-conversion';

async function must(response: Promise<{ status: number; text: string; body: any }>, status: number): Promise<any> {
  const answer = await response;
  if (answer.status !== status) throw new Error(`expected ${status}, got ${answer.status}: ${answer.text}`);
  return answer.body;
}

interface Transfer {
  url: string;
  raw: number;
  wire: number;
}

/** Records every script and JSON response of a page with its decoded and encoded body sizes. */
function recordTransfers(page: Page): { scripts: Transfer[]; json: Transfer[]; settled(): Promise<void> } {
  const scripts: Transfer[] = [];
  const json: Transfer[] = [];
  const pending: Promise<void>[] = [];
  page.on('response', (response: Response) => {
    const type = response.headers()['content-type'] ?? '';
    const isScript = /javascript/.test(type);
    const isJson = /application\/json/.test(type);
    if (!isScript && !isJson) return;
    pending.push(
      (async () => {
        try {
          const [body, sizes] = await Promise.all([response.body(), response.request().sizes()]);
          (isScript ? scripts : json).push({ url: new URL(response.url()).pathname, raw: body.length, wire: sizes.responseBodySize });
        } catch {
          // A response the page dropped (navigation) has no body to read.
        }
      })(),
    );
  });
  return { scripts, json, settled: async () => void (await Promise.all(pending)) };
}

async function freshContext(browser: Browser, baseUrl: string, session: Client): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, baseURL: baseUrl });
  await context.addCookies([...session.cookies].map(([name, value]) => ({ name, value, url: baseUrl })));
  return context;
}

/** Waits until no island is left to hydrate. */
async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelector('astro-island[ssr]') === null);
}

const kB = (bytes: number) => (bytes / 1024).toFixed(1).padStart(8);
const sum = (list: Transfer[], key: 'raw' | 'wire') => list.reduce((total, item) => total + item[key], 0);

function timings(samples: number[]): string {
  const sorted = [...samples].sort((a, b) => a - b);
  return `median ${sorted[Math.floor(sorted.length / 2)]!.toFixed(0)} ms, min ${sorted[0]!.toFixed(0)} ms, max ${sorted.at(-1)!.toFixed(0)} ms (${sorted.length} runs)`;
}

const server = await startRunsServer();
const browser = await launchHeadlessChromium();
try {
  const client = new Client(server.baseUrl);
  await must(client.signIn(engineer, demoPassword), 200);
  const captures = (await must(client.get('/api/captures?pageSize=100'), 200)).items as { id: string; name: string }[];
  const chains = (await must(client.get('/api/chains?pageSize=100'), 200)).items as { id: string; name: string }[];
  const capture = captures.find((item) => item.name === demoCapture);
  const chain = chains.find((item) => item.name === demoChain);
  if (!capture || !chain) throw new Error('the demo capture or chain is missing');
  const runId = (await must(client.post('/api/runs', { chain_id: chain.id, capture_id: capture.id }), 202)).runs[0].id as string;
  for (;;) {
    const run = await must(client.get(`/api/runs/${runId}`), 200);
    if (run.status === 'succeeded') break;
    if (run.status !== 'queued' && run.status !== 'running') throw new Error(`the run ended ${run.status}`);
    await sleep(100);
  }

  // 1 and 3: page weight, each page in its own empty context.
  const pages = [
    { name: 'chain page', path: `/chains/${chain.id}`, ready: '[data-testid^="probe-readouts-"]' },
    { name: 'capture page', path: `/captures/${capture.id}`, ready: '[data-testid="spectrum-plot"][data-plot-ready]' },
    { name: 'run page', path: `/runs/${runId}`, ready: '[data-plot-ready]' },
  ];
  const jsonSeen = new Map<string, Transfer>();
  console.log('JavaScript per page (kB, raw / over the wire):');
  for (const target of pages) {
    const context = await freshContext(browser, server.baseUrl, client);
    const page = await context.newPage();
    const record = recordTransfers(page);
    await page.goto(target.path);
    await hydrated(page);
    await page.locator(target.ready).first().waitFor({ timeout: 120_000 });
    await page.waitForLoadState('networkidle');
    await record.settled();
    // QUADRILLE_SHOTS_DIR: a full-page screenshot of each page, to look at its plots.
    if (process.env.QUADRILLE_SHOTS_DIR) await page.screenshot({ path: `${process.env.QUADRILLE_SHOTS_DIR}/weight-${target.name.replace(' ', '-')}.png`, fullPage: true });
    console.log(`  ${target.name.padEnd(13)} ${kB(sum(record.scripts, 'raw'))} / ${kB(sum(record.scripts, 'wire'))}   (${record.scripts.length} scripts)`);
    for (const item of record.json) {
      const key = item.url.replace(/[0-9a-f-]{20,}/g, ':id');
      if ((jsonSeen.get(key)?.raw ?? 0) < item.raw) jsonSeen.set(key, { ...item, url: key });
    }
    await context.close();
  }

  // 2: click to first plot / readouts, new user each time.
  const toPlot: number[] = [];
  const toReadouts: number[] = [];
  for (let k = 0; k < repeat; k++) {
    const context = await freshContext(browser, server.baseUrl, client);
    const page = await context.newPage();
    await page.goto('/captures');
    await hydrated(page);
    const link = page.getByRole('link', { name: demoCapture });
    await link.waitFor();
    let start = performance.now();
    await link.click();
    await page.locator('[data-plot-ready]').first().waitFor({ timeout: 120_000 });
    toPlot.push(performance.now() - start);
    await context.close();

    const chainContext = await freshContext(browser, server.baseUrl, client);
    const chainPage = await chainContext.newPage();
    await chainPage.goto('/chains');
    await hydrated(chainPage);
    const chainLink = chainPage.getByRole('link', { name: demoChain, exact: true });
    await chainLink.waitFor();
    start = performance.now();
    await chainLink.click();
    await chainPage.locator('[data-testid^="probe-readouts-"]').first().waitFor({ timeout: 120_000 });
    toReadouts.push(performance.now() - start);
    await chainContext.close();
  }
  console.log(`Click on a capture to its first plot: ${timings(toPlot)}`);
  console.log(`Click on a chain to its readouts:     ${timings(toReadouts)}`);

  console.log('Largest JSON answers on those pages (kB, raw / over the wire):');
  for (const item of [...jsonSeen.values()].sort((a, b) => b.raw - a.raw).slice(0, 6)) {
    console.log(`  ${kB(item.raw)} / ${kB(item.wire)}  ${item.url}`);
  }
} finally {
  await browser.close();
  await server.stop();
}
