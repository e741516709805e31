import { Router } from 'express';
import { adminUserPatchSchema, idParamSchema } from '@shared/schemas/auth';
import { currentUser, requireRole } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { cameraBodyPatchSchema, cameraBodySchema, slugParamSchema } from '@shared/schemas/vocab';
import { cameraBodies } from '../vocab/service';
import { adminService } from './service';

export interface AdminDeps {
  /** Camera bodies are searchable words of every part that names them. */
  onBodiesChanged?: () => void;
}

export function adminRoutes({ onBodiesChanged }: AdminDeps = {}) {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/users', async (_req, res) => {
    const users = await adminService.listUsers();
    res.json({ users: users.map((u) => u.toPublic()) });
  });

  router.patch(
    '/users/:id',
    handler({ params: idParamSchema, body: adminUserPatchSchema }, async ({ params, body }, req, res) => {
      const user = await adminService.updateUser(currentUser(req)!, params.id, body);
      res.json({ user: user.toPublic() });
    }),
  );

  router.post(
    '/bodies',
    handler({ body: cameraBodySchema }, async ({ body: input }, _req, res) => {
      const body = await cameraBodies.create(input);
      onBodiesChanged?.();
      res.status(201).json({ body: body.toInfo() });
    }),
  );

  router.patch(
    '/bodies/:slug',
    handler({ params: slugParamSchema, body: cameraBodyPatchSchema }, async ({ params, body: patch }, _req, res) => {
      const body = await cameraBodies.update(params.slug, patch);
      onBodiesChanged?.();
      res.json({ body: body.toInfo() });
    }),
  );

  router.delete(
    '/bodies/:slug',
    handler({ params: slugParamSchema }, async ({ params }, _req, res) => {
      await cameraBodies.remove(params.slug);
      onBodiesChanged?.();
      res.status(204).end();
    }),
  );

  return router;
}
