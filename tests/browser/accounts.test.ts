/**
 * The admin's accounts screen and the account page as a person uses them, in Debian's chromium
 * against the built server: an account created through the form joins the table, a role changed
 * in the table stays changed after a reload, a refused creation and a wrong current password are
 * shown beside their field, and the new account signs in with its first password and changes it.
 */
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserSuite, hasChromium, hydrated, signInWithForm } from '../helpers/browser';

describe.skipIf(!hasChromium)('accounts in a browser', { timeout: 90_000 }, () => {
  const suite = browserSuite();
  // Unique to this run, so each test makes the rows it reads.
  const stamp = Date.now().toString(36);
  const firstPassword = 'first-password-123';

  async function adminPage(): Promise<Page> {
    const page = await suite.tabs.open({ viewport: { width: 1280, height: 800 } });
    await signInWithForm(page, 'admin@saltmarsh.test');
    await page.waitForURL(suite.server.baseUrl + '/');
    await page.goto('/admin');
    await hydrated(page);
    await page.locator('form[data-ready][aria-label="Create an account"]').waitFor();
    return page;
  }

  /** Fills the admin's create form and sends it. */
  async function createThroughForm(page: Page, email: string): Promise<void> {
    const form = page.getByRole('form', { name: 'Create an account' });
    await form.getByLabel('E-mail').fill(email);
    await form.getByLabel('Name').fill('New Engineer');
    await form.getByLabel('First password').fill(firstPassword);
    await form.getByRole('button', { name: 'Create account' }).click();
  }

  it('creates an account that joins the table, refuses a duplicate beside the e-mail, and changes its role', async () => {
    const email = `new.engineer.${stamp}@saltmarsh.test`;
    const page = await adminPage();
    const form = page.getByRole('form', { name: 'Create an account' });
    await createThroughForm(page, email);
    const row = page.locator(`[data-testid="users-table"] tr[data-email="${email}"]`);
    await row.waitFor();
    expect(await row.textContent()).toContain('New Engineer');
    await expect.poll(() => form.getByRole('status').textContent()).toContain(`Account created for ${email}`);

    // The same e-mail again: the server refuses it and the form says so beside the field.
    await createThroughForm(page, email);
    await form.locator('[data-field-error="email"]').waitFor();
    expect(await page.locator(`[data-testid="users-table"] tr[data-email="${email}"]`).count()).toBe(1);

    await page.getByLabel(`Role of ${email}`).selectOption('operator');
    await expect.poll(() => page.getByText(`${email} is now`).count()).toBe(1);
    await page.reload();
    await hydrated(page);
    expect(await page.getByLabel(`Role of ${email}`).inputValue()).toBe('operator');
  });

  it('lets the new account sign in and change its password, a wrong current one shown beside its field', async () => {
    const email = `password.changer.${stamp}@saltmarsh.test`;
    const admin = await adminPage();
    await createThroughForm(admin, email);
    await admin.locator(`[data-testid="users-table"] tr[data-email="${email}"]`).waitFor();

    const page = await suite.tabs.open({ viewport: { width: 1280, height: 800 } });
    await signInWithForm(page, email, firstPassword);
    await page.waitForURL(suite.server.baseUrl + '/');
    await page.goto('/account');
    const form = page.locator('form[data-ready][aria-label="Change password"]');
    await form.waitFor();
    await form.getByLabel('Current password').fill('not-the-password-1');
    await form.getByLabel('New password', { exact: true }).fill('second-password-456');
    await form.getByLabel('Repeat the new password').fill('second-password-456');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.locator('[data-field-error="currentPassword"]').waitFor();

    await form.getByLabel('Current password').fill(firstPassword);
    await form.getByRole('button', { name: 'Change password' }).click();
    await expect.poll(() => form.textContent()).toContain('Password changed.');
    expect(await form.getByLabel('Current password').inputValue()).toBe('');
  });
});
