import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { buildPatchSchema, buildSchema } from '@shared/schemas/builds';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { buildsService } from './service';

/** /api/builds: a member's own camera builds. */
export function buildRoutes() {
  const router = Router();
  router.use(requireAuth);
  const params = idParamSchema;

  router.get('/', async (req, res) => {
    res.json({ items: await buildsService.list(currentUser(req)!) });
  });
  router.post(
    '/',
    handler({ body: buildSchema }, async ({ body }, req, res) => {
      const build = await buildsService.create(currentUser(req)!, body);
      res.status(201).location(`/api/builds/${build.id}`).json(build);
    }),
  );
  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await buildsService.get(currentUser(req)!, params.id));
    }),
  );
  router.patch(
    '/:id',
    handler({ params, body: buildPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await buildsService.update(currentUser(req)!, params.id, body));
    }),
  );
  router.delete(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      await buildsService.remove(currentUser(req)!, params.id);
      res.status(204).end();
    }),
  );
  return router;
}
