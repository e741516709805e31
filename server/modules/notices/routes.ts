import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { noticePreferencesSchema } from '@shared/schemas/notices';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { Alerts } from './alerts';
import { notices } from './service';

export function noticesRoutes(alerts: Alerts) {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(await notices.list(currentUser(req)!.id));
  });

  router.get('/settings', async (req, res) => {
    res.json({ preferences: await alerts.preferences(currentUser(req)!.id) });
  });

  router.put(
    '/settings',
    handler({ body: noticePreferencesSchema }, async ({ body }, req, res) => {
      res.json({ preferences: await alerts.setPreferences(currentUser(req)!.id, body) });
    }),
  );

  router.post('/read-all', async (req, res) => {
    await notices.markAllRead(currentUser(req)!.id);
    res.status(204).end();
  });

  router.post(
    '/:id/read',
    handler({ params: idParamSchema }, async ({ params }, req, res) => {
      await notices.markRead(currentUser(req)!.id, params.id);
      res.status(204).end();
    }),
  );

  return router;
}
