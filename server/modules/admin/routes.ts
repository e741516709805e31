import { Router } from 'express';
import { adminUserPatchSchema, idParamSchema, type AdminUserPatch } from '@shared/schemas/auth';
import { currentUser, requireRole } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { cameraBodyPatchSchema, cameraBodySchema, slugParamSchema, type CameraBodyInput } from '@shared/schemas/vocab';
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

  router.patch('/users/:id', validate('params', idParamSchema), validate('body', adminUserPatchSchema), async (req, res) => {
    const { id } = res.locals.params as { id: number };
    const user = await adminService.updateUser(currentUser(req)!, id, res.locals.body as AdminUserPatch);
    res.json({ user: user.toPublic() });
  });

  router.post('/bodies', validate('body', cameraBodySchema), async (_req, res) => {
    const body = await cameraBodies.create(res.locals.body as CameraBodyInput);
    onBodiesChanged?.();
    res.status(201).json({ body: body.toInfo() });
  });

  router.patch('/bodies/:slug', validate('params', slugParamSchema), validate('body', cameraBodyPatchSchema), async (req, res) => {
    const body = await cameraBodies.update(req.params.slug as string, res.locals.body as Partial<CameraBodyInput>);
    onBodiesChanged?.();
    res.json({ body: body.toInfo() });
  });

  router.delete('/bodies/:slug', validate('params', slugParamSchema), async (req, res) => {
    await cameraBodies.remove(req.params.slug as string);
    onBodiesChanged?.();
    res.status(204).end();
  });

  return router;
}
