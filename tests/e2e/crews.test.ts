import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { DEMO_CREW_NAME, DEMO_CREW_PART_TITLE } from '../../server/demo/0017-demo-crew-shelf';
import { forgetSession, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
}, 240_000);
afterAll(async () => {
  await rig?.close();
});

const DESK = { width: 1366, height: 800 };
const PHONE = { width: 390, height: 844 };
const lead = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;

describe('browser · crews', () => {
  it('demo lead · invites by e-mail from the crew page, the invited account joins from the mailed link · both see the new member', async () => {
    const { page } = rig;
    await page.setViewportSize(DESK);
    await signInThroughForm(page, lead.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');

    await page.goto('/crews');
    await page.locator('[data-test="crew-list"]').getByText(DEMO_CREW_NAME).click();
    await page.locator('[data-test="crew-name"]').waitFor();
    await page.locator('#invite-email').fill(admin.email);
    await page.locator('[data-test="send-invitation"]').click();
    await page.locator('[data-test="crew-invitations"]').getByText(admin.email).waitFor();
    await rig.screenshot('crews-1-crew-page-desk');
    const crewPath = new URL(page.url()).pathname;

    // the part form offers the crew as a choice; the crew-only part is marked on its page
    await page.goto('/search?q=slate+holder');
    await page.getByText(DEMO_CREW_PART_TITLE).first().click();
    await page.locator('[data-test="crew-only"]').waitFor();
    expect(await page.locator('[data-test="crew-only"]').textContent()).toContain(DEMO_CREW_NAME);

    await forgetSession(page);
    await page.setViewportSize(PHONE);
    await signInThroughForm(page, admin.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');
    // the outbox delivers on its own loop: look until the invitation is in the local mailbox
    let invitation: { to: string[]; text: string } | undefined;
    await expect
      .poll(
        async () => {
          const messages = (await (await page.request.get('/api/dev/mailbox')).json()).items as { to: string[]; text: string }[];
          invitation = messages.find((m) => m.to.join(' ').includes(admin.email) && m.text.includes('/invitations/'));
          return !!invitation;
        },
        { timeout: 30_000 },
      )
      .toBe(true);
    const link = new URL(/https?:\/\/\S+\/invitations\/[A-Za-z0-9_-]+/.exec(invitation!.text)![0]);
    await page.goto(link.pathname);
    expect(await page.locator('[data-test="invitation-crew"]').textContent()).toBe(DEMO_CREW_NAME);
    await rig.screenshot('crews-2-invitation-phone');
    await page.locator('[data-test="accept-invitation"]').click();
    await page.waitForURL((url) => url.pathname === crewPath);
    await page.locator('[data-test="crew-members"]').getByText(admin.displayName).waitFor();
    await rig.screenshot('crews-3-crew-page-phone');
  });
});
