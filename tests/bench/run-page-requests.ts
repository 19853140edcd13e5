/**
 * Requests a run page makes: a built server (dist/, or QUADRILLE_TEST_DIST) with one finished run
 * whose probes have a spectrum, a trace and a constellation; headless chromium opens the run page
 * and waits until every plot is drawn and the network is idle, then counts the requests by kind
 * and the bytes of the API answers.
 *
 *   npx tsx tests/bench/run-page-requests.ts
 */
import { demoPassword } from '@/lib/server/seed';
import { Client } from '../helpers/client';
import { launchHeadlessChromium } from '../helpers/chromium';
import { sleep, startRunsServer } from '../api/runs-server';

async function must(response: Promise<{ status: number; body: any; text: string }>, status: number): Promise<any> {
  const answer = await response;
  if (answer.status !== status) throw new Error(`expected ${status}, got ${answer.status}: ${answer.text}`);
  return answer.body;
}

async function main(): Promise<void> {
  const server = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '1' } });
  const browser = await launchHeadlessChromium();
  try {
    const client = new Client(server.baseUrl);
    await client.signIn('engineer@saltmarsh.test', demoPassword);
    const capture = await must(
      client.post('/api/synth', {
        name: 'Request count beacon',
        visibility: 'team',
        spec: { sampleRate: 4_000_000, duration: 0.05, tones: [{ frequency: 520_000, level: -6, phase: 0 }], noise: { mode: 'total', level: -70 }, seed: 1 },
      }),
      201,
    );
    const document = {
      version: 1,
      name: 'Request count chain',
      stages: [
        { id: 'nco', kind: 'mix', params: { frequency: -500_000 } },
        { id: 'lp', kind: 'filter', params: { design: 'window', response: 'lowpass', cutoff: 200_000, taps: 127 } },
        { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false }, probe: true },
        { id: 'psd', kind: 'spectrum', params: { fftSize: 4096 }, probe: true },
        { id: 'meas', kind: 'measure', params: {} },
      ],
    };
    const chain = await must(client.post('/api/chains', { name: document.name, visibility: 'team', document }), 201);
    const run = (await must(client.post('/api/runs', { chain_id: chain.id, capture_id: capture.id }), 202)).runs[0];
    for (;;) {
      const state = await must(client.get(`/api/runs/${run.id}`), 200);
      if (state.status === 'succeeded') break;
      if (state.status !== 'queued' && state.status !== 'running') throw new Error(`run ended ${state.status}`);
      await sleep(200);
    }

    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, baseURL: server.baseUrl });
    await context.addCookies([...client.cookies].map(([name, value]) => ({ name, value, url: server.baseUrl })));
    const page = await context.newPage();
    const requests: { url: string; type: string }[] = [];
    const apiBytes = new Map<string, number>();
    page.on('request', (request) => requests.push({ url: request.url(), type: request.resourceType() }));
    page.on('response', (response) => {
      const url = new URL(response.url());
      if (!url.pathname.startsWith('/api/')) return;
      void response.body().then((body) => apiBytes.set(url.pathname + url.search, body.length), () => undefined);
    });
    await page.goto(`/runs/${run.id}`);
    // Every plot card of the page drawn: the spectra, the trace and the constellation.
    for (const id of ['spectrum-plot-psd', 'spectrum-plot-dec', 'trace-plot-dec', 'constellation-plot-dec']) {
      await page.locator(`[data-testid="${id}"][data-plot-ready]`).waitFor({ timeout: 60_000 });
    }
    await page.waitForLoadState('networkidle');
    const api = requests.filter((r) => new URL(r.url).pathname.startsWith('/api/'));
    const byType = new Map<string, number>();
    for (const request of requests) byType.set(request.type, (byType.get(request.type) ?? 0) + 1);
    console.log(`dist: ${process.env.QUADRILLE_TEST_DIST ?? 'dist'}`);
    console.log(`requests in all: ${requests.length} (${[...byType].map(([type, n]) => `${type} ${n}`).join(', ')})`);
    console.log(`API requests: ${api.length}`);
    for (const request of api) {
      const url = new URL(request.url);
      console.log(`  ${url.pathname}${url.search}  ${apiBytes.get(url.pathname + url.search) ?? '?'} bytes`);
    }
    await context.close();
  } finally {
    await browser.close();
    await server.stop();
  }
}

await main();
