import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import { calibrationSchema, madeKitItemSchema, makeFileQuerySchema, makeKindParamsSchema, makeRequestSchema } from '@shared/schemas/make';
import { kitParamsSchema, printerParamsSchema } from '@shared/schemas/planning';
import { currentUser, requireAuth } from '../../middleware/auth';
import { parsed, validate } from '../../middleware/validate';
import type { MakeService } from './service';

/** /api/make: the makers, previews and files. Open to visitors; a printer's calibration needs its owner. */
export function makeRoutes(make: MakeService) {
  const router = Router();
  const kind = validate('params', makeKindParamsSchema);
  const body = validate('body', makeRequestSchema);

  router.get('/', (_req, res) => {
    res.json(make.list());
  });
  router.post('/:kind/preview', kind, body, async (req, res) => {
    res.set('Cache-Control', 'no-store');
    res.json(await make.preview(currentUser(req), parsed(res, 'params', makeKindParamsSchema).kind, parsed(res, 'body', makeRequestSchema)));
  });
  router.post('/:kind/file', kind, validate('query', makeFileQuerySchema), body, async (req, res) => {
    const { format } = parsed(res, 'query', makeFileQuerySchema);
    const file = await make.file(currentUser(req), parsed(res, 'params', makeKindParamsSchema).kind, parsed(res, 'body', makeRequestSchema), format);
    res.attachment(file.fileName);
    res.type(file.mime);
    res.set('X-Content-Type-Options', 'nosniff');
    res.set('Cache-Control', 'no-store');
    res.send(file.body);
  });
  return router;
}

/** /api/printers/:id/calibrations: what the fit-test gauge showed, per material. The printer's owner only. */
export function calibrationRoutes(make: MakeService) {
  const router = Router();
  router.use(requireAuth);
  const printer = validate('params', printerParamsSchema);
  router.get('/:id/calibrations', printer, async (req, res) => {
    res.json(await make.calibrations(currentUser(req)!, parsed(res, 'params', printerParamsSchema).id));
  });
  router.post('/:id/calibrations', printer, validate('body', calibrationSchema), async (req, res) => {
    const created = await make.calibrate(currentUser(req)!, parsed(res, 'params', printerParamsSchema).id, parsed(res, 'body', calibrationSchema));
    res.status(201).json(created);
  });
  return router;
}

/** /api/kits/:id/made: a made part into a kit (anyone who may edit the kit). */
export function madeKitRoutes(make: MakeService, sequelize: Sequelize) {
  const router = Router();
  router.post('/:id/made', requireAuth, validate('params', kitParamsSchema), validate('body', madeKitItemSchema), async (req, res) => {
    const item = await make.addToKit(currentUser(req)!, parsed(res, 'params', kitParamsSchema).id, parsed(res, 'body', madeKitItemSchema), sequelize);
    res.status(201).json(item);
  });
  return router;
}
