// Rate-limit counters in MariaDB (table rate_limits), so every app instance counts against the same
// limit: three instances behind a balancer allow what one allows. A store for express-rate-limit and
// express-slow-down (their Store interface). Each hit is one atomic INSERT … ON DUPLICATE KEY UPDATE
// that starts a new window when the old one has ended; times come from the database's clock, so
// instances with skewed clocks still agree. Expired rows are deleted by the jobs runner's chores.
import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import { transact } from '../../db/transaction';

const KEY_MAX = 191;

export class MariaDbRateStore implements Store {
  readonly localKeys = false;
  private windowMs = 60_000;

  constructor(
    private readonly sequelize: Sequelize,
    /** Keeps each limiter's counters apart ("login-ip:", "login-account:", …). */
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private key(key: string): string {
    const full = `${this.prefix}${key}`;
    return full.length <= KEY_MAX ? full : `${this.prefix}sha256:${createHash('sha256').update(key).digest('hex')}`.slice(0, KEY_MAX);
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await this.sequelize.query<{ hits: number; resetAt: Date }>(
      'SELECT hits, reset_at AS resetAt FROM rate_limits WHERE rate_key = :k AND reset_at > NOW(3)',
      { replacements: { k: this.key(key) }, type: QueryTypes.SELECT },
    );
    return row ? { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const k = this.key(key);
    return transact(this.sequelize, async (t) => {
      // assignments run left to right: hits reads the old reset_at before it is moved on
      await this.sequelize.query(
        `INSERT INTO rate_limits (rate_key, hits, reset_at) VALUES (:k, 1, NOW(3) + INTERVAL :us MICROSECOND)
         ON DUPLICATE KEY UPDATE hits = IF(reset_at <= NOW(3), 1, hits + 1),
                                 reset_at = IF(reset_at <= NOW(3), VALUES(reset_at), reset_at)`,
        { replacements: { k, us: Math.round(this.windowMs * 1000) }, type: QueryTypes.INSERT, transaction: t },
      );
      const [row] = await this.sequelize.query<{ hits: number; resetAt: Date }>('SELECT hits, reset_at AS resetAt FROM rate_limits WHERE rate_key = :k', {
        replacements: { k },
        type: QueryTypes.SELECT,
        transaction: t,
      });
      return { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) };
    });
  }

  async decrement(key: string): Promise<void> {
    await this.sequelize.query('UPDATE rate_limits SET hits = GREATEST(hits, 1) - 1 WHERE rate_key = :k AND reset_at > NOW(3)', {
      replacements: { k: this.key(key) },
      type: QueryTypes.UPDATE,
    });
  }

  async resetKey(key: string): Promise<void> {
    await this.sequelize.query('DELETE FROM rate_limits WHERE rate_key = :k', { replacements: { k: this.key(key) }, type: QueryTypes.DELETE });
  }
}
