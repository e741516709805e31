import { Router } from 'express';
import { adminUserPatchSchema, idParamSchema, type AdminUserPatch } from '@shared/schemas/auth';
import { currentUser, requireRole } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { adminService } from './service';

export function adminRoutes() {
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

  return router;
}
