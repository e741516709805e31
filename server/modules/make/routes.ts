import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import { calibrationSchema, madeKitItemSchema, makeFileQuerySchema, makeKindParamsSchema, makeRequestSchema } from '@shared/schemas/make';
import { kitParamsSchema, printerParamsSchema } from '@shared/schemas/planning';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { MakeService } from './service';

/** /api/make: the makers, previews and files. Open to visitors; a printer's calibration needs its owner. */
export function makeRoutes(make: MakeService) {
  const router = Router();
  const input = { params: makeKindParamsSchema, body: makeRequestSchema };

  router.get('/', (_req, res) => {
    res.json(make.list());
  });
  router.post(
    '/:kind/preview',
    handler(input, async ({ params, body }, req, res) => {
      res.set('Cache-Control', 'no-store');
      res.json(await make.preview(currentUser(req), params.kind, body));
    }),
  );
  router.post(
    '/:kind/file',
    handler({ ...input, query: makeFileQuerySchema }, async ({ params, query, body }, req, res) => {
      const file = await make.file(currentUser(req), params.kind, body, query.format);
      res.attachment(file.fileName);
      res.type(file.mime);
      res.set('X-Content-Type-Options', 'nosniff');
      res.set('Cache-Control', 'no-store');
      res.send(file.body);
    }),
  );
  return router;
}

/** /api/printers/:id/calibrations: what the fit-test gauge showed, per material. The printer's owner only. */
export function calibrationRoutes(make: MakeService) {
  const router = Router();
  router.use(requireAuth);
  const params = printerParamsSchema;
  router.get(
    '/:id/calibrations',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await make.calibrations(currentUser(req)!, params.id));
    }),
  );
  router.post(
    '/:id/calibrations',
    handler({ params, body: calibrationSchema }, async ({ params, body }, req, res) => {
      const created = await make.calibrate(currentUser(req)!, params.id, body);
      res.status(201).json(created);
    }),
  );
  return router;
}

/** /api/kits/:id/made: a made part into a kit (anyone who may edit the kit). */
export function madeKitRoutes(make: MakeService, sequelize: Sequelize) {
  const router = Router();
  router.post(
    '/:id/made',
    requireAuth,
    handler({ params: kitParamsSchema, body: madeKitItemSchema }, async ({ params, body }, req, res) => {
      const item = await make.addToKit(currentUser(req)!, params.id, body, sequelize);
      res.status(201).json(item);
    }),
  );
  return router;
}
