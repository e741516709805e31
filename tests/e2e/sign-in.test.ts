import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/db/seeders/0001-demo-crew';
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
  it('signs in through the form as the demo member and shows the name in the top bar', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');
    const account = page.locator('[data-test="account-button"]');
    await account.waitFor();
    expect(await account.textContent()).toContain(member.displayName);
    const shot = await rig.screenshot('sign-in-demo-member');
    expect(existsSync(shot)).toBe(true);
  });

  it('shows the generic message for a wrong password', async () => {
    const { page } = rig;
    await forgetSession(page);
    await signInThroughForm(page, member.email, 'not the password');
    const error = page.locator('[data-test="sign-in-error"]');
    await error.waitFor();
    expect(await error.textContent()).toContain('do not match');
  });

  it('register · a weak password · the form says why on the field; a good one · "check your mail", nobody signed in', async () => {
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
  });
});
