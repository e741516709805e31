// Writes a client may send more than once (a set report or rating queued offline and sent when the
// signal returns, perhaps twice over a flaky link; a part submission or kit item whose connection
// closed unanswered) carry an Idempotency-Key. The first request stores its answer under the key,
// inside its own transaction; a repeat gets that answer back and files nothing.
import type { Request } from 'express';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import { clientKeySchema } from '@shared/schemas/notices';
import { ClientKey } from '../../db/models';
import { AppError } from '../../errors';

/** The Idempotency-Key a write carries, if any; a malformed one is a 422. */
export function clientKeyOf(req: Request): string | undefined {
  const raw = req.get('idempotency-key');
  if (raw === undefined) return undefined;
  const parsed = clientKeySchema.safeParse(raw);
  if (!parsed.success) {
    const message = parsed.error.issues[0]?.message ?? 'The Idempotency-Key header is malformed.';
    throw AppError.field('idempotencyKey', message);
  }
  return parsed.data;
}

export async function replayOf<T>(userId: number, clientKey: string, scope: string, transaction?: Transaction): Promise<T | undefined> {
  const row = await ClientKey.findOne({ where: { userId, clientKey }, transaction });
  if (!row) return undefined;
  if (row.scope !== scope) {
    throw new AppError(422, 'idempotency_key_reused', 'That Idempotency-Key was already used for another entry. Send a new key with each new entry.');
  }
  return JSON.parse(row.result) as T;
}

export async function rememberKey(userId: number, clientKey: string, scope: string, result: unknown, transaction?: Transaction): Promise<void> {
  await ClientKey.create({ userId, clientKey, scope, result: JSON.stringify(result) }, { transaction });
}

/**
 * For a keyed write that failed: the same key sent twice at once, the first to commit filed it and
 * this one answers with that answer; any other failure is thrown again.
 */
export async function answerOfFirst<T>(err: unknown, userId: number, clientKey: string | undefined, scope: string): Promise<T> {
  const seen = clientKey && err instanceof UniqueConstraintError ? await replayOf<T>(userId, clientKey, scope) : undefined;
  if (!seen) throw err;
  return seen;
}
