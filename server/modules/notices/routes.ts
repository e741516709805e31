import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { currentUser, requireAuth } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { notices } from './service';

export function noticesRoutes() {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(await notices.list(currentUser(req)!.id));
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
