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
});
