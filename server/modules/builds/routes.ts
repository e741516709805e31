import { Router } from 'express';
import { idParamSchema } from '@shared/schemas/auth';
import { buildPatchSchema, buildSchema } from '@shared/schemas/builds';
import { currentUser, requireAuth } from '../../middleware/auth';
import { parsed, validate } from '../../middleware/validate';
import { buildsService } from './service';

/** /api/builds: a member's own camera builds. */
export function buildRoutes() {
  const router = Router();
  router.use(requireAuth);
  const id = (res: { locals: Record<string, unknown> }) => (res.locals.params as { id: number }).id;
  const params = validate('params', idParamSchema);

  router.get('/', async (req, res) => {
    res.json({ items: await buildsService.list(currentUser(req)!) });
  });
  router.post('/', validate('body', buildSchema), async (req, res) => {
    const build = await buildsService.create(currentUser(req)!, parsed(res, 'body', buildSchema));
    res.status(201).location(`/api/builds/${build.id}`).json(build);
  });
  router.get('/:id', params, async (req, res) => {
    res.json(await buildsService.get(currentUser(req)!, id(res)));
  });
  router.patch('/:id', params, validate('body', buildPatchSchema), async (req, res) => {
    res.json(await buildsService.update(currentUser(req)!, id(res), parsed(res, 'body', buildPatchSchema)));
  });
  router.delete('/:id', params, async (req, res) => {
    await buildsService.remove(currentUser(req)!, id(res));
    res.status(204).end();
  });
  return router;
}
