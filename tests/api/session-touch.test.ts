// Rolling sessions are touched at the end of every answer, after its headers went out: a touch the
// database refuses for a moment must not cut the answer off (nor hold its end back).
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { Session } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

describe('sessions · touch', () => {
  it('sessions · the expiry update fails (the database node went away) · the answer arrives whole and the member stays signed in', async () => {
    const { email, password } = await makeUser('member');
    const member = await agentFor(t.app);
    expect((await member.login(email, password)).status).toBe(200);
    // what the mariadb connector reports when its connection was reset under a query, wrapped as Sequelize wraps it
    const reset = Object.assign(new Error('read ECONNRESET'), { original: { code: 'ECONNRESET', errno: -104 } });
    const update = vi.spyOn(Session, 'update').mockRejectedValueOnce(reset);
    const errors = vi.spyOn(console, 'error').mockImplementation(() => undefined);
    try {
      const me = await member.get('/api/auth/me').expect(200);
      expect(me.body.user.email).toBe(email);
      expect(update).toHaveBeenCalled();
      // the touch is written beside the answer, so its failure is logged a moment after it
      await vi.waitFor(() => expect(errors.mock.calls.some((c) => String(c[0]).includes('expiry could not be moved on'))).toBe(true));
    } finally {
      update.mockRestore();
      errors.mockRestore();
    }
    expect((await member.get('/api/auth/me').expect(200)).body.user.email).toBe(email);
  });
});
