import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { OutboxMail } from '../../db/models';
import { freshUser } from '../helpers/api';
import { startBrowserRig, type BrowserRig } from './browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => rig?.close());

async function newPage() {
  const context = await rig.browser.newContext({ viewport: { width: 1400, height: 900 } });
  context.setDefaultTimeout(10_000);
  return context.newPage();
}

describe('passwords in the browser', () => {
  it('a forgotten password: the link from the mail, a weak password refused on the form, a strong one set, the link then spent', async () => {
    const { email } = await freshUser(['buyer']);
    const page = await newPage();
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'Mail me a link' }).click();
    await page.getByText('Check your mail').waitFor();

    const mail = await OutboxMail.findOne({ where: { recipients: { [Op.contains]: [email] } }, order: [['id', 'DESC']] });
    const link = new URL(mail!.bodyText.match(/https?:\/\/\S+\/reset-password#token=[\w-]+/)![0]);
    const resetUrl = `${rig.baseUrl}${link.pathname}${link.hash}`;
    await page.goto(resetUrl);
    const form = page.getByRole('form', { name: 'Choose a new password' });
    await form.getByLabel('New password', { exact: true }).fill('aaaaaaaaaa');
    await form.getByRole('button', { name: 'Set new password' }).click();
    await form.getByText(/^This password is too easy to guess\. Repeated characters like "aaa"/).waitFor();

    await form.getByLabel('New password', { exact: true }).fill('kettle-orbit-47-plum');
    await form.getByRole('button', { name: 'Set new password' }).click();
    await form.getByText('Password changed').waitFor();

    await form.getByRole('link', { name: 'Sign in' }).click();
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password', { exact: true }).fill('kettle-orbit-47-plum');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByTestId('signed-in-user').waitFor();

    // The spent link, opened again: the server refuses it, and the page leaves nothing to type.
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.goto(resetUrl);
    await form.getByLabel('New password', { exact: true }).fill('another-kettle-48-plum');
    await form.getByRole('button', { name: 'Set new password' }).click();
    await form.getByText('This reset link has already been used, or a newer one was used instead.').waitFor();
    expect(await form.getByLabel('New password', { exact: true }).count()).toBe(0);
    await form.getByRole('link', { name: 'Ask for a new link' }).waitFor();
    await page.context().close();
  });

  it('a change of password from the user menu needs the current one', async () => {
    const { email, password } = await freshUser(['auditor']);
    const page = await newPage();
    await page.goto(`${rig.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password', { exact: true }).fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('link', { name: 'Change password' }).click();

    const form = page.getByRole('form', { name: 'Change password' });
    await form.getByLabel('Current password').fill('not-the-current-one');
    await form.getByLabel('New password', { exact: true }).fill('lantern-basalt-93-fig');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('This is not your current password').waitFor();

    await form.getByLabel('Current password').fill(password);
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('Your password is changed. Your other sessions have ended.').waitFor();
    // This session stays signed in.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Overview' }).click();
    await page.getByTestId('signed-in-user').waitFor();
    await page.context().close();
  });
});
