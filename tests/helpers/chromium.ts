/**
 * Debian's chromium launched headless the way every browser test and page benchmark needs it on
 * this kind of machine (root, no GPU, no outside network). No vitest imports: the benchmarks run
 * it as plain scripts.
 */
import { chromium, type Browser } from 'playwright-core';

export const chromiumPath = '/usr/bin/chromium';

/** Launches headless chromium; every launch gets a fresh temporary profile (user-data dir) of its own. */
export function launchHeadlessChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
}
