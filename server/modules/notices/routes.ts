import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { noticePreferencesSchema, type NoticePreferencesInput } from '@shared/schemas/notices';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
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

  router.put('/settings', validate('body', noticePreferencesSchema), async (req, res) => {
    res.json({ preferences: await alerts.setPreferences(currentUser(req)!.id, res.locals.body as NoticePreferencesInput) });
  });

  router.post('/read-all', async (req, res) => {
    await notices.markAllRead(currentUser(req)!.id);
    res.status(204).end();
  });

  router.post('/:id/read', validate('params', idParamSchema), async (req, res) => {
    await notices.markRead(currentUser(req)!.id, (res.locals.params as { id: number }).id);
    res.status(204).end();
  });

  return router;
}
