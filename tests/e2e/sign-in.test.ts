import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { request } from 'playwright-core';
import type { MailboxMessage } from '@shared/types';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { forgetSession, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;

describe('browser · sign-in', () => {
  it('sign-in · the demo member through the form · signed in, the name in the top bar', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');
    const account = page.locator('[data-test="account-button"]');
    await account.waitFor();
    expect(await account.textContent()).toContain(member.displayName);
    const shot = await rig.screenshot('sign-in-demo-member');
    expect(existsSync(shot)).toBe(true);
  });

  it('sign-in · a wrong password · the generic message', async () => {
    const { page } = rig;
    await forgetSession(page);
    await signInThroughForm(page, member.email, 'not the password');
    const error = page.locator('[data-test="sign-in-error"]');
    await error.waitFor();
    expect(await error.textContent()).toContain('do not match');
  });

  it('register · a weak password · the form says why on the field; a good one: "check your mail", nobody signed in', async () => {
    const { page } = rig;
    await forgetSession(page);
    await page.goto('/register');
    const email = `browser-${Date.now()}@crew.test`;
    await page.getByLabel('Name your crew knows you by').fill('Bea Browser');
    await page.getByLabel('E-mail').fill(email);
    await page.locator('#password').fill('aaaaaaaaaa');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByText('repeated or consecutive characters').waitFor();
    // the common-password list is checked on the server; its answer lands on the same field
    await page.locator('#password').fill('password12');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByText('list of common passwords').waitFor();
    await page.locator('#password').fill('gaffer tape and a quiet dolly');
    await page.getByRole('button', { name: 'Create account' }).click();
    const sent = page.locator('[data-test="register-sent"]');
    await sent.waitFor();
    expect(await sent.textContent()).toContain(`Check your mail: a message is on its way to ${email}`);
    expect(await page.locator('[data-test="account-button"]').count()).toBe(0);
    await rig.screenshot('register-check-your-mail');

    // the first sign-in of the new account: no "welcome back", a prompt to confirm the address
    await signInThroughForm(page, email, 'gaffer tape and a quiet dolly');
    await page.waitForURL((url) => url.pathname === '/');
    const welcome = page.locator('[data-test="welcome"]');
    await welcome.waitFor();
    expect(await welcome.textContent()).toContain('Welcome to the shelf, Bea Browser');
    expect(await welcome.textContent()).not.toContain('back');
    const prompt = page.locator('[data-test="confirm-email-prompt"]');
    expect(await prompt.textContent()).toContain(email);
    await page.locator('[data-test="confirm-email-resend"]').click();
    await page.locator('[data-test="confirm-email-sent"]').waitFor();
    expect(await page.locator('[data-test="confirm-email-sent"]').textContent()).toContain(`on its way to ${email}`);
    await rig.screenshot('register-first-sign-in');

    // the newest link confirms it, and the page leads on
    // the link as delivered: the local fake SMTP server's mailbox, read as the demo admin
    const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;
    const asAdmin = await request.newContext({ baseURL: rig.server.url });
    const csrf = (await (await asAdmin.get('/api/auth/csrf')).json()).csrfToken as string;
    await asAdmin.post('/api/auth/login', { headers: { 'X-CSRF-Token': csrf }, data: { email: admin.email, password: DEMO_PASSWORD } });
    let link = '';
    await expect
      .poll(
        async () => {
          const items = ((await (await asAdmin.get('/api/dev/mailbox')).json()).items ?? []) as MailboxMessage[];
          const newest = items.find((m) => m.to.some((to) => to.includes(email)) && /verify-email\?token=/.test(m.text));
          link = newest ? /\/verify-email\?token=[^\s"<>]+/.exec(newest.text)![0] : '';
          return link;
        },
        { timeout: 30_000 },
      )
      .not.toBe('');
    await asAdmin.dispose();
    await page.goto(link);
    await page.locator('[data-test="verified-next"]').waitFor();
    expect(await page.locator('[data-test="verified-next"]').textContent()).toContain('Find a part for your rig');
    expect(await page.getByText('Ask for a new link').count()).toBe(0);
    await rig.screenshot('register-confirmed');
    await page.locator('[data-test="verified-next"]').getByText('Find a part for your rig').click();
    await page.waitForURL((url) => url.pathname === '/search');
    await page.goto('/');
    await welcome.waitFor();
    expect(await welcome.textContent()).toContain('Welcome back, Bea Browser');
    expect(await prompt.count()).toBe(0);
  });
});
