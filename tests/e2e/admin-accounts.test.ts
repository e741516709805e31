import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/db/models';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';

let rig: BrowserRig;
beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;
const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;
const roleOf = async () => (await User.findOne({ where: { email: member.email } }))!.role;
const statusOf = async () => (await User.findOne({ where: { email: member.email } }))!.status;

describe('browser · admin accounts', () => {
  it('accounts · a role change and a suspension · ask first, apply on yes, and can be undone', async () => {
    const { page } = rig;
    await signInThroughForm(page, admin.email, DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname === '/');
    await page.goto('/admin/users');
    const row = page.locator('tr', { hasText: member.email });
    await row.waitFor();

    // picking a role asks first; "leave it" changes nothing
    await row.getByRole('combobox', { name: `Role of ${member.displayName}` }).selectOption({ label: 'moderator' });
    const dialog = page.getByRole('alertdialog');
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain(`Make ${member.displayName} a moderator?`);
    await dialog.getByRole('button', { name: 'Leave it as it is' }).click();
    expect(await roleOf()).toBe('member');

    // yes applies it, and undo takes it back
    await row.getByRole('combobox', { name: `Role of ${member.displayName}` }).selectOption({ label: 'moderator' });
    await dialog.getByRole('button', { name: 'Change it' }).click();
    const undo = page.locator('[data-test="admin-undo"]');
    await undo.waitFor();
    expect(await undo.textContent()).toContain(`${member.displayName} is now a moderator.`);
    await expect.poll(roleOf).toBe('moderator');
    await rig.screenshot('admin-accounts-undo');
    await page.locator('[data-test="admin-undo-button"]').click();
    await undo.waitFor({ state: 'detached' });
    expect(await roleOf()).toBe('member');

    // suspending asks first too, then undo lets them sign in again
    await row.getByRole('switch', { name: `${member.displayName} is active` }).click();
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain('signed out at once');
    await rig.screenshot('admin-accounts-suspend-ask');
    await dialog.getByRole('button', { name: 'Suspend' }).click();
    await undo.waitFor();
    await expect.poll(statusOf).toBe('suspended');
    await page.locator('[data-test="admin-undo-button"]').click();
    await undo.waitFor({ state: 'detached' });
    expect(await statusOf()).toBe('active');
  });
});
