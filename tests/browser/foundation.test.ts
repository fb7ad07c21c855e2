import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserRig, signedInPage, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

describe('sign-in and navigation in the browser', () => {
  it('shows the clerk the clerk navigation and no site administration', async () => {
    const page = await signedInPage(rig, 'clerk');
    const nav = page.getByRole('navigation', { name: 'Main' });
    for (const area of ['Overview', 'Receiving', 'Lots', 'Stock']) await expect(nav.getByRole('link', { name: area }).isVisible()).resolves.toBe(true);
    for (const area of ['Users', 'Site settings', 'Exports', 'Audit trail']) expect(await nav.getByRole('link', { name: area }).count()).toBe(0);
    expect(await page.getByTestId('signed-in-user').textContent()).toBeTruthy();
    await page.goto(`${rig.baseUrl}/admin/users`);
    await page.getByText('Not available to your role').waitFor();
    await page.context().close();
  });

  it('gives the auditor no way to change anything', async () => {
    const page = await signedInPage(rig, 'auditor');
    await page.waitForLoadState('networkidle');
    const changeControls = page.locator('main').getByRole('button').or(page.locator('main input, main select, main textarea'));
    expect(await changeControls.count()).toBe(0);
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).count()).toBe(0);
    await page.context().close();
  });

  it('shows an error for a wrong password and stays on sign-in', async () => {
    const context = await rig.browser.newContext();
    const page = await context.newPage();
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill('clerk@phaselot.test');
    await page.getByLabel('Password').fill('definitely-wrong');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page.getByRole('alert').textContent()).resolves.toContain('Wrong e-mail or password');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await context.close();
  });

  it('lets the admin create a user from the Users page', async () => {
    const page = await signedInPage(rig, 'admin');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click();
    await page.getByRole('button', { name: 'New user' }).click();
    const form = page.getByRole('form', { name: 'New user' });
    await form.getByLabel('Name').fill('Ilse Marchetti');
    await form.getByLabel('E-mail').fill(`ilse.${Date.now()}@example.test`);
    await form.getByLabel('Initial password').fill('a-long-initial-password');
    await form.getByLabel('QC inspector').check();
    await form.getByRole('button', { name: 'Create user' }).click();
    await page.getByRole('cell', { name: 'Ilse Marchetti' }).waitFor();
    await page.context().close();
  });
});
