import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { forgetSession, signInThroughForm, startBrowserRig, type BrowserRig } from '../helpers/browser';
import { boxStl } from '../helpers/meshes';
import { submission } from '../helpers/parts';

let rig: BrowserRig;
const member = DEMO_ACCOUNTS.find((a) => a.role === 'member')!;
const moderator = DEMO_ACCOUNTS.find((a) => a.role === 'moderator')!;
const title = 'Follow-focus whip holder';

beforeAll(async () => {
  rig = await startBrowserRig();
});
afterAll(async () => {
  await rig?.close();
});

/** Submits through the API as the member signed in on the page (the submit form has its own test). */
async function submitAsPageUser(): Promise<number> {
  const { page } = rig;
  const token = await page.evaluate(async () => (await (await fetch('/api/auth/csrf')).json()).csrfToken as string);
  const res = await page.request.post('/api/parts', {
    headers: { 'X-CSRF-Token': token },
    multipart: {
      data: JSON.stringify(submission({ title, safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false } })),
      model: { name: 'holder.stl', mimeType: 'model/stl', buffer: boxStl(30, 20, 12) },
    },
  });
  expect(res.status()).toBe(201);
  return (await res.json()).id;
}

describe('browser · the review desk', () => {
  it('review desk · a member submits, the demo moderator approves with a note · the member sees it published and the notice', async () => {
    const { page } = rig;
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    const id = await submitAsPageUser();
    await page.goto(`/parts/${id}`);
    await page.getByText('At the review desk').first().waitFor();

    // the moderator, in a fresh session
    await forgetSession(page);
    await signInThroughForm(page, moderator.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    await page.locator('[data-test="nav-review"]').click();
    await page.locator(`[data-test="queue-item-${id}"]`).click();
    await page.locator('[data-test="checklist"]').waitFor();
    await rig.screenshot('review-desk-1-submission');
    for (const box of await page.locator('[data-test="checklist"] input[type="checkbox"]').all()) await box.check();
    await page.locator('#decision-note').fill('Checked the bore against a 15 mm rod: good fit.');
    await page.locator('[data-test="approve"]').click();
    await page.waitForURL((u) => u.pathname === '/review');

    // back to the member
    await forgetSession(page);
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    await page.locator('[data-test="notice-count"]').waitFor();
    await page.locator('[data-test="notice-bell"]').click();
    const list = page.locator('[data-test="notice-list"]');
    await list.waitFor();
    expect(await list.textContent()).toContain(`On the shelf: ${title}`);
    await rig.screenshot('review-desk-2-notice');
    await list.locator('button', { hasText: `On the shelf: ${title}` }).click();
    await page.waitForURL((u) => u.pathname.startsWith('/parts/'));
    await page.getByText('On the shelf').first().waitFor();
    await rig.screenshot('review-desk-3-published');
  });

  it('desk · a part sent back and changed · shows the model in 3D, revision 2, and the note in the edit form', async () => {
    const { page } = rig;
    await forgetSession(page);
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    const id = await submitAsPageUser();

    await forgetSession(page);
    await signInThroughForm(page, moderator.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    await page.goto(`/review/${id}`);
    await page.locator('[data-test="desk-viewer"] canvas').first().waitFor({ timeout: 30_000 });
    await page.locator('#decision-note').fill('Add a photo of the print on the rod.');
    await page.locator('[data-test="send-back"]').click();
    await page.waitForURL((u) => u.pathname === '/review');

    // the contributor's edit form shows what the desk asked for
    await forgetSession(page);
    await signInThroughForm(page, member.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    await page.goto(`/parts/${id}/edit`);
    const note = page.locator('[data-test="edit-desk-note"]');
    await note.waitFor();
    expect(await note.textContent()).toContain('Add a photo of the print on the rod.');
    await rig.screenshot('review-desk-4-edit-with-note');
    const token = await page.evaluate(async () => (await (await fetch('/api/auth/csrf')).json()).csrfToken as string);
    expect(
      (
        await page.request.patch(`/api/parts/${id}`, { headers: { 'X-CSRF-Token': token }, data: { summary: 'Now with the photo the desk asked for.' } })
      ).status(),
    ).toBe(200);

    // the desk now shows the second version
    await forgetSession(page);
    await signInThroughForm(page, moderator.email, DEMO_PASSWORD);
    await page.waitForURL((u) => u.pathname === '/');
    await page.goto(`/review/${id}`);
    await page.locator('[data-test="checklist"]').waitFor();
    expect(await page.locator('.rs-kicker').first().textContent()).toContain('revision 2');
    await rig.screenshot('review-desk-5-resubmitted');
  });
});
