// What admins can do with the outbox: see recent mail and put a failed one back in the queue.
import { MailMessage } from '../../db/models';
import { AppError } from '../../errors';

export const OUTBOX_LIST_LIMIT = 200;

export const outboxService = {
  /** The newest mail first. */
  async list(): Promise<MailMessage[]> {
    return MailMessage.findAll({ order: [['id', 'DESC']], limit: OUTBOX_LIST_LIMIT });
  },

  /** Queues a mail that failed (or is waiting for its next attempt) to be sent now. */
  async retry(id: number): Promise<MailMessage> {
    const row = await MailMessage.findByPk(id);
    if (!row) throw AppError.notFound('There is no mail with that id in the outbox.');
    if (row.status === 'sent') throw AppError.conflict('That mail was already delivered; there is nothing to retry.');
    await row.update({ status: 'queued', nextAttemptAt: new Date() });
    return row;
  },
};
