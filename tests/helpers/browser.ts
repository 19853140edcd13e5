/**
 * What every browser test shares: Debian's chromium launched headless, a tab at a laptop-sized
 * viewport signed in as a demo account, waiting for Astro's islands to hydrate, and screenshots
 * in light and dark when QUADRILLE_SHOTS_DIR is set.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll } from 'vitest';
import { type Browser, type BrowserContext, type BrowserContextOptions, type Page } from 'playwright-core';
import { demoPassword } from '@/lib/server/seed';
import { signedIn } from '../api/runs-helpers';
import type { Client } from './client';
import { startServer, type StartOptions, type TestServer } from './server';

export { demoPassword };

import { chromiumPath, launchHeadlessChromium } from './chromium';

export { chromiumPath };
const chromiumPresent = existsSync(chromiumPath);
const inCi = ['true', '1'].includes((process.env.CI ?? '').toLowerCase());
/**
 * Whether the browser suites run (`describe.skipIf(!hasChromium)`): they are skipped only on a
 * developer machine without Debian's chromium. With CI=true they run anyway, and a missing
 * chromium fails them (launchChromium says why) instead of letting CI pass without them.
 */
export const hasChromium = chromiumPresent || inCi;
if (!chromiumPresent) {
  const consequence = inCi ? 'CI=true, so the browser suites FAIL' : 'skipping the browser tests';
  console.warn(`${chromiumPath} is absent: ${consequence}. Install it with \`apt-get install -y chromium\` (.ci/run does).`);
}

/** Where screenshots go; unset means none are taken. */
export const shotsDir = process.env.QUADRILLE_SHOTS_DIR;

/** Launches headless chromium; every launch gets a fresh temporary profile (user-data dir) of its own. */
export async function launchChromium(): Promise<Browser> {
  if (!chromiumPresent) throw new Error(`${chromiumPath} is absent and CI=true: the browser suites must run in CI. Install it with \`apt-get install -y chromium\`.`);
  return launchHeadlessChromium();
}

export interface ContextOptions extends BrowserContextOptions {
  /** A client signed in through the API: its session cookie goes into the context, skipping the sign-in form. */
  session?: Client;
}

const contextErrors = new WeakMap<BrowserContext, string[]>();

/** The uncaught errors (hydration mismatches included) the context's pages have thrown so far. */
export function pageErrorsOf(page: Page): string[] {
  return contextErrors.get(page.context()) ?? [];
}

/** A new isolated context (own cookies and storage) on `baseUrl`, 1280×900 px unless a viewport is given. */
async function openContext(browser: Browser, baseUrl: string, { session, ...options }: ContextOptions = {}): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, baseURL: baseUrl, ...options });
  if (session) await context.addCookies([...session.cookies].map(([name, value]) => ({ name, value, url: baseUrl })));
  // A page that never draws (an island that threw, a chunk or request that failed) otherwise only
  // shows up as a locator timeout: say what the page itself saw.
  const errors: string[] = [];
  contextErrors.set(context, errors);
  context.on('weberror', (error) => {
    errors.push(error.error().message);
    console.error(`[browser] page error: ${error.error().message}`);
  });
  context.on('requestfailed', (request) => request.failure()?.errorText !== 'net::ERR_ABORTED' && console.error(`[browser] request failed: ${request.method()} ${request.url()} (${request.failure()?.errorText})`));
  return context;
}

/** One tab at a time: opening the next closes the previous context, so accounts never share cookies. */
export class OneTab {
  context: BrowserContext | null = null;

  constructor(
    private readonly browser: Browser,
    private readonly baseUrl: string,
  ) {}

  /** A fresh tab in a new context with `options`. */
  async open(options: ContextOptions = {}): Promise<Page> {
    await this.close();
    this.context = await openContext(this.browser, this.baseUrl, options);
    return this.context.newPage();
  }

  /** A fresh tab signed in as the demo account `email` (session cookie from the sign-in API, as the form would set it). */
  async pageAs(email: string): Promise<Page> {
    return this.open({ session: await signedIn(this.baseUrl, email) });
  }

  async close(): Promise<void> {
    await this.context?.close();
    this.context = null;
  }
}

export interface BrowserSuite {
  server: TestServer;
  browser: Browser;
  tabs: OneTab;
}

/**
 * Registers the set-up and tear-down of a browser suite (call inside `describe`): the built server
 * with a fresh data folder (demo seed unless told), chromium, and one tab at a time on it. Read
 * the fields inside hooks and tests, once the set-up has run.
 */
export function browserSuite(options: StartOptions = {}): BrowserSuite {
  const suite = {} as BrowserSuite;
  beforeAll(async () => {
    suite.server = await startServer(options);
    suite.browser = await launchChromium();
    suite.tabs = new OneTab(suite.browser, suite.server.baseUrl);
  });
  afterAll(async () => {
    await suite.tabs?.close();
    await suite.browser?.close();
    await suite.server?.stop();
  });
  return suite;
}

/** Fills and sends the sign-in form once React has attached to it (does not wait for where it leads). */
export async function signInWithForm(page: Page, email: string, password = demoPassword): Promise<void> {
  await page.goto('/sign-in');
  await page.locator('form[data-ready]').waitFor();
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Waits until every island on the page has hydrated (Astro drops the `ssr` attribute then). */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelector('astro-island[ssr]') === null);
}

export interface ShootOptions {
  /** Viewport widths in px (default 1280 only); 1280 px is 900 px tall, wider ones 1400 px. */
  widths?: number[];
  /** @deprecated Ignored: each shot waits for the plots to redraw instead of a fixed time. */
  settleMs?: number;
}

/**
 * Waits until the page has redrawn after a resize or theme change: fonts loaded, then two
 * animation frames (the first runs the resize/theme handlers, the second paints what they drew).
 */
async function settled(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await document.fonts.ready;
    await new Promise<void>((done) => requestAnimationFrame(() => requestAnimationFrame(() => done())));
  });
}

/**
 * Full-page screenshots `<name>-<width>-<light|dark>.png` in QUADRILLE_SHOTS_DIR (nothing when it
 * is unset); leaves the page at 1280×900 px in the light theme.
 */
export async function shoot(page: Page, name: string, { widths = [1280] }: ShootOptions = {}): Promise<void> {
  if (!shotsDir) return;
  mkdirSync(shotsDir, { recursive: true });
  // From the top: a full-page shot of a scrolled page draws the sticky header mid-page.
  await page.evaluate(() => window.scrollTo(0, 0));
  for (const width of widths) {
    for (const scheme of ['light', 'dark'] as const) {
      await page.setViewportSize({ width, height: width === 1280 ? 900 : 1400 });
      await page.emulateMedia({ colorScheme: scheme });
      await settled(page);
      await page.screenshot({ path: join(shotsDir, `${name}-${width}-${scheme}.png`), fullPage: true });
    }
  }
  await page.setViewportSize({ width: 1280, height: 900 });
  await page.emulateMedia({ colorScheme: 'light' });
}
