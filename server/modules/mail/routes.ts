import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { requireRole } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { FakeSmtp } from './fake-smtp';
import type { Mailer } from './outbox';
import { outboxService } from './service';

/** /api/admin/mail: the outbox, for admins to see what was not delivered and retry it. */
export function mailAdminRoutes(mailer: Mailer) {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/', async (_req, res) => {
    const rows = await outboxService.list();
    res.json({ items: rows.map((r) => r.toItem()) });
  });

  router.post(
    '/:id/retry',
    handler({ params: idParamSchema }, async ({ params }, _req, res) => {
      const row = await outboxService.retry(params.id);
      mailer.kick();
      res.json({ item: row.toItem() });
    }),
  );

  return router;
}

/** /api/dev/mailbox: what the local fake SMTP server caught, newest first. Mounted outside production only. */
export function devMailboxRoutes(fake: FakeSmtp) {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/mailbox', (_req, res) => {
    res.json({ items: fake.messages().reverse() });
  });

  return router;
}
