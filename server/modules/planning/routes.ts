import { Router } from 'express';
import {
  estimateSchema,
  kitItemParamsSchema,
  kitItemPatchSchema,
  kitItemSchema,
  kitParamsSchema,
  kitPatchSchema,
  kitSchema,
  kitCrewSharesSchema,
  kitSharesSchema,
  priceSheetSchema,
  printerParamsSchema,
  printerPatchSchema,
  printerSchema,
} from '@shared/schemas/planning';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { clientKeyOf } from '../evidence/client-keys';
import type { PlanningService } from './service';

/** /api/estimate: open to visitors too; a signed-in member's price sheet fills in missing prices. */
export function estimateRoutes(planning: PlanningService) {
  const router = Router();
  router.post(
    '/',
    handler({ body: estimateSchema }, async ({ body }, req, res) => {
      res.json(await planning.estimate(currentUser(req), body));
    }),
  );
  return router;
}

/** /api/printers: a member's own printers. */
export function printerRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  const params = printerParamsSchema;

  router.get('/', async (req, res) => {
    res.json(await planning.listPrinters(currentUser(req)!));
  });
  router.post(
    '/',
    handler({ body: printerSchema }, async ({ body }, req, res) => {
      const printer = await planning.createPrinter(currentUser(req)!, body);
      res.status(201).location(`/api/printers/${printer.id}`).json(printer);
    }),
  );
  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await planning.getPrinter(currentUser(req)!, params.id));
    }),
  );
  router.patch(
    '/:id',
    handler({ params, body: printerPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await planning.updatePrinter(currentUser(req)!, params.id, body));
    }),
  );
  router.delete(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      await planning.deletePrinter(currentUser(req)!, params.id);
      res.status(204).end();
    }),
  );
  return router;
}

/** /api/me/prices: a member's own filament and electricity prices. */
export function priceRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  router.get('/', async (req, res) => {
    res.json(await planning.prices(currentUser(req)!));
  });
  router.put(
    '/',
    handler({ body: priceSheetSchema }, async ({ body }, req, res) => {
      res.json(await planning.setPrices(currentUser(req)!, body));
    }),
  );
  return router;
}

/** /api/kits: shoot kits, their items, shares, summary and CSV export. */
export function kitRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  const params = kitParamsSchema;

  router.get('/', async (req, res) => {
    res.json(await planning.listKits(currentUser(req)!));
  });
  router.post(
    '/',
    handler({ body: kitSchema }, async ({ body }, req, res) => {
      const kit = await planning.createKit(currentUser(req)!, body);
      res.status(201).location(`/api/kits/${kit.id}`).json(kit);
    }),
  );
  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await planning.getKit(currentUser(req)!, params.id));
    }),
  );
  router.patch(
    '/:id',
    handler({ params, body: kitPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await planning.updateKit(currentUser(req)!, params.id, body));
    }),
  );
  router.delete(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      await planning.deleteKit(currentUser(req)!, params.id);
      res.status(204).end();
    }),
  );

  router.post(
    '/:id/items',
    handler({ params, body: kitItemSchema }, async ({ params, body }, req, res) => {
      const item = await planning.addItem(currentUser(req)!, params.id, body, clientKeyOf(req));
      res.status(201).json(item);
    }),
  );
  router.patch(
    '/:id/items/:itemId',
    handler({ params: kitItemParamsSchema, body: kitItemPatchSchema }, async ({ params, body }, req, res) => {
      res.json(await planning.updateItem(currentUser(req)!, params.id, params.itemId, body));
    }),
  );
  router.delete(
    '/:id/items/:itemId',
    handler({ params: kitItemParamsSchema }, async ({ params }, req, res) => {
      await planning.deleteItem(currentUser(req)!, params.id, params.itemId);
      res.status(204).end();
    }),
  );

  router.put(
    '/:id/shares',
    handler({ params, body: kitSharesSchema }, async ({ params, body }, req, res) => {
      res.json(await planning.setShares(currentUser(req)!, params.id, body));
    }),
  );

  router.put(
    '/:id/crew-shares',
    handler({ params, body: kitCrewSharesSchema }, async ({ params, body }, req, res) => {
      res.json(await planning.setCrewShares(currentUser(req)!, params.id, body));
    }),
  );

  router.delete(
    '/:id/shares/me',
    handler({ params }, async ({ params }, req, res) => {
      await planning.leave(currentUser(req)!, params.id);
      res.status(204).end();
    }),
  );

  router.get(
    '/:id/summary',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await planning.summary(currentUser(req)!, params.id));
    }),
  );
  router.get(
    '/:id/export.csv',
    handler({ params }, async ({ params }, req, res) => {
      const { fileName, body } = await planning.exportCsv(currentUser(req)!, params.id);
      res.attachment(fileName);
      res.set('Content-Type', 'text/csv; charset=utf-8');
      res.set('X-Content-Type-Options', 'nosniff');
      res.set('Cache-Control', 'no-store');
      res.send(body);
    }),
  );
  return router;
}
