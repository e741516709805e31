import { AccessDeniedError, ConnectionRefusedError, type Sequelize } from 'sequelize';
import { describe, expect, it } from 'vitest';
import { StartupError, waitForDatabase } from '../../server/db/wait';

function fakeDb(failures: Error[]) {
  let calls = 0;
  const db = {
    async authenticate() {
      calls += 1;
      const next = failures.shift();
      if (next) throw next;
    },
  } as unknown as Sequelize;
  return { db, calls: () => calls };
}

const refused = () => new ConnectionRefusedError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:3307'), { code: 'ECONNREFUSED' }));

describe('waitForDatabase', () => {
  it('waitForDatabase · refused twice, then up · says it waits, then that MariaDB is up', async () => {
    const { db, calls } = fakeDb([refused(), refused()]);
    const lines: string[] = [];
    await waitForDatabase(db, { host: '127.0.0.1', port: 3307, waitSeconds: 10, firstDelayMs: 1, log: (l) => lines.push(l) });
    expect(calls()).toBe(3);
    expect(lines).toEqual(['waiting for MariaDB at 127.0.0.1:3307… (giving up after 10 s)', 'MariaDB at 127.0.0.1:3307 is up']);
  });

  it('waitForDatabase · wrong password · fails at once with a StartupError naming the settings to check', async () => {
    const denied = new AccessDeniedError(Object.assign(new Error("Access denied for user 'rigshelf'@'localhost'"), { code: 'ER_ACCESS_DENIED_ERROR' }));
    const { db, calls } = fakeDb([denied]);
    const err = await waitForDatabase(db, { host: '127.0.0.1', port: 3307, waitSeconds: 10, firstDelayMs: 1, log: () => undefined }).catch((e) => e);
    expect(err).toBeInstanceOf(StartupError);
    expect(calls()).toBe(1);
    expect(err.message).toMatch(/^cannot use MariaDB at 127\.0\.0\.1:3307: .*Access denied.*check DB_USER, DB_PASSWORD and DB_NAME/);
    expect(err.message).not.toContain('\n');
  });

  it('waitForDatabase · never answers · gives up with one line naming host, port and the wait', async () => {
    const { db } = fakeDb(Array.from({ length: 100 }, refused));
    const err = await waitForDatabase(db, { host: 'db.internal', port: 3399, waitSeconds: 0.05, firstDelayMs: 10, log: () => undefined }).catch((e) => e);
    expect(err).toBeInstanceOf(StartupError);
    expect(err.message).toBe(
      'MariaDB at db.internal:3399 did not answer within 0.05 s (connect ECONNREFUSED 127.0.0.1:3307); start it (npm start does) or check DB_HOST and DB_PORT (or DB_HOSTS)',
    );
  });
});
