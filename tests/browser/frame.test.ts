/**
 * The application frame as a person uses it, in Debian's chromium against the built server:
 * sign-in for each role, navigation by role, the 403 and 404 pages, the remembered theme,
 * errors beside their field, sign-out and the skip link.
 */
import { describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { browserSuite, demoPassword, hasChromium, hydrated, signInWithForm } from '../helpers/browser';

const accounts = [
  { email: 'admin@saltmarsh.test', role: 'Admin', seesAdmin: true },
  { email: 'engineer@saltmarsh.test', role: 'Engineer', seesAdmin: false },
  { email: 'operator@saltmarsh.test', role: 'Operator', seesAdmin: false },
] as const;

// A loaded two-core machine can take several seconds per sign-in (argon2 and a cold page).
describe.skipIf(!hasChromium)('application frame in a browser', { timeout: 60_000 }, () => {
  const suite = browserSuite();

  // Cookies of each account once signed in through the form, so later tests skip the argon2 wait.
  const signedIn = new Map<string, Awaited<ReturnType<BrowserContext['storageState']>>>();

  /** A new isolated tab (own cookies and storage) at a laptop-sized viewport, signed in as `email` if given. */
  async function freshPage(email?: string): Promise<Page> {
    const storageState = email ? signedIn.get(email) : undefined;
    if (email && !storageState) throw new Error(`${email} has not signed in through the form yet`);
    return suite.tabs.open({ viewport: { width: 1280, height: 800 }, storageState });
  }

  async function sectionNames(page: Page): Promise<string[]> {
    const names = await page.getByRole('navigation', { name: 'Sections' }).getByRole('link').allTextContents();
    return names.map((name) => name.trim());
  }

  for (const account of accounts) {
    it(`signs in ${account.email} and shows the navigation of the role`, async () => {
      const page = await freshPage();
      await signInWithForm(page, account.email);
      await page.waitForURL(suite.server.baseUrl + '/');
      const expected = account.seesAdmin ? ['Captures', 'Chains', 'Runs', 'Admin'] : ['Captures', 'Chains', 'Runs'];
      expect(await sectionNames(page)).toEqual(expected);
      await expect.poll(() => page.getByTestId('user-menu-button').textContent()).toContain(account.role);
      signedIn.set(account.email, await suite.tabs.context!.storageState());
    });
  }

  it('goes on to the page asked for before signing in', async () => {
    const page = await freshPage();
    await page.goto('/runs');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await page.locator('form[data-ready]').waitFor();
    await page.getByLabel('E-mail').fill('engineer@saltmarsh.test');
    await page.getByLabel('Password').fill(demoPassword);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(suite.server.baseUrl + '/runs');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Runs');
  });

  it('answers an operator opening /admin with the 403 page', async () => {
    const page = await freshPage('operator@saltmarsh.test');
    const response = await page.goto('/admin');
    expect(response?.status()).toBe(403);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain("can't open the Admin pages");
    expect(await page.getByRole('link', { name: 'Go to the overview' }).count()).toBe(1);
  });

  it('answers an unknown address with the 404 page', async () => {
    const page = await freshPage('engineer@saltmarsh.test');
    const response = await page.goto('/no/such/page');
    expect(response?.status()).toBe(404);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('There is no page at this address');
  });

  it('remembers the chosen theme across a reload', async () => {
    const page = await freshPage('engineer@saltmarsh.test');
    await page.emulateMedia({ colorScheme: 'light' });
    await page.goto('/');
    const surface = () => page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    const lightSurface = await surface();
    await hydrated(page);
    await page.getByRole('button', { name: 'Dark theme' }).click();
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await page.reload();
    await hydrated(page);
    // The inline head script sets the theme before paint; the switch shows the choice once hydrated.
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    expect(await surface()).not.toBe(lightSurface);
    await expect.poll(() => page.getByRole('button', { name: 'Dark theme' }).getAttribute('aria-pressed')).toBe('true');
    await page.getByRole('button', { name: 'Follow the system theme' }).click();
    await page.reload();
    expect(await page.evaluate(() => document.documentElement.dataset.theme ?? null)).toBeNull();
    expect(await surface()).toBe(lightSurface);
  });

  it('shows a wrong password error beside the password field and stays on sign-in', async () => {
    const page = await freshPage();
    await signInWithForm(page, 'engineer@saltmarsh.test', 'not-the-password');
    const error = page.locator('[data-field-error="password"]');
    await error.waitFor();
    expect(await error.textContent()).toMatch(/wrong/i);
    expect(await page.getByLabel('Password').getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByLabel('Password').getAttribute('aria-describedby')).toBe(await error.getAttribute('id'));
    expect(new URL(page.url()).pathname).toBe('/sign-in');
  });

  it('shows a missing e-mail beside the e-mail field without asking the server', async () => {
    const page = await freshPage();
    await page.goto('/sign-in');
    await page.locator('form[data-ready]').waitFor();
    await page.getByRole('button', { name: 'Sign in' }).click();
    expect(await page.locator('[data-field-error="email"]').textContent()).toMatch(/e-mail/i);
  });

  it('signs out from the user menu and returns to sign-in', async () => {
    const page = await freshPage();
    await signInWithForm(page, 'engineer@saltmarsh.test');
    await page.waitForURL(suite.server.baseUrl + '/');
    await hydrated(page);
    await page.getByTestId('user-menu-button').click();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(suite.server.baseUrl + '/sign-in');
    await page.goto('/captures');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
  });

  it('offers a skip link as the first keyboard stop', async () => {
    const page = await freshPage('engineer@saltmarsh.test');
    await page.goto('/');
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.textContent?.trim())).toBe('Skip to main content');
    await page.keyboard.press('Enter');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('main');
  });
});

describe.skipIf(!hasChromium)('first run without demo accounts', { timeout: 60_000 }, () => {
  const suite = browserSuite({ demo: false });

  it('offers to create the admin account on the sign-in page and signs it in', async () => {
    const page = await suite.tabs.open({ viewport: { width: 1280, height: 800 } });
    await page.goto('/');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await page.locator('form[data-ready]').waitFor();
    await page.getByLabel('E-mail').fill('first.admin@saltmarsh.test');
    await page.getByLabel('Name').fill('Odile Brandt');
    await page.getByLabel('Password').fill('short');
    await page.getByRole('button', { name: 'Create the admin account' }).click();
    expect(await page.locator('[data-field-error="password"]').textContent()).toMatch(/10 characters/);
    await page.getByLabel('Password').fill('a-long-enough-password');
    await page.getByRole('button', { name: 'Create the admin account' }).click();
    await page.waitForURL(suite.server.baseUrl + '/');
    const names = await page.getByRole('navigation', { name: 'Sections' }).getByRole('link').allTextContents();
    expect(names.map((name) => name.trim())).toContain('Admin');
  });
});
