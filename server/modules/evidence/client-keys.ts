// Writes a client may send more than once (a set report or rating queued offline and sent when the
// signal returns, perhaps twice over a flaky link) carry an Idempotency-Key. The first request stores
// its answer under the key, inside its own transaction; a repeat gets that answer back and files nothing.
import type { Transaction } from 'sequelize';
import { ClientKey } from '../../db/models';
import { AppError } from '../../errors';

export async function replayOf<T>(userId: number, clientKey: string, scope: string, transaction?: Transaction): Promise<T | undefined> {
  const row = await ClientKey.findOne({ where: { userId, clientKey }, transaction });
  if (!row) return undefined;
  if (row.scope !== scope) {
    throw new AppError(
      422,
      'idempotency_key_reused',
      'That Idempotency-Key was already used for another report or rating. Send a new key with each new entry.',
    );
  }
  return JSON.parse(row.result) as T;
}

export async function rememberKey(userId: number, clientKey: string, scope: string, result: unknown, transaction?: Transaction): Promise<void> {
  await ClientKey.create({ userId, clientKey, scope, result: JSON.stringify(result) }, { transaction });
}
