import { Router } from 'express';
import type { z } from 'zod';
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
import { parsed, validate } from '../../middleware/validate';
import type { PlanningService } from './service';

/** /api/estimate: open to visitors too; a signed-in member's price sheet fills in missing prices. */
export function estimateRoutes(planning: PlanningService) {
  const router = Router();
  router.post('/', validate('body', estimateSchema), async (req, res) => {
    res.json(await planning.estimate(currentUser(req), parsed(res, 'body', estimateSchema)));
  });
  return router;
}

/** /api/printers: a member's own printers. */
export function printerRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  const id = (res: { locals: Record<string, unknown> }) => (res.locals.params as z.output<typeof printerParamsSchema>).id;

  router.get('/', async (req, res) => {
    res.json(await planning.listPrinters(currentUser(req)!));
  });
  router.post('/', validate('body', printerSchema), async (req, res) => {
    const printer = await planning.createPrinter(currentUser(req)!, parsed(res, 'body', printerSchema));
    res.status(201).location(`/api/printers/${printer.id}`).json(printer);
  });
  router.get('/:id', validate('params', printerParamsSchema), async (req, res) => {
    res.json(await planning.getPrinter(currentUser(req)!, id(res)));
  });
  router.patch('/:id', validate('params', printerParamsSchema), validate('body', printerPatchSchema), async (req, res) => {
    res.json(await planning.updatePrinter(currentUser(req)!, id(res), parsed(res, 'body', printerPatchSchema)));
  });
  router.delete('/:id', validate('params', printerParamsSchema), async (req, res) => {
    await planning.deletePrinter(currentUser(req)!, id(res));
    res.status(204).end();
  });
  return router;
}

/** /api/me/prices: a member's own filament and electricity prices. */
export function priceRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  router.get('/', async (req, res) => {
    res.json(await planning.prices(currentUser(req)!));
  });
  router.put('/', validate('body', priceSheetSchema), async (req, res) => {
    res.json(await planning.setPrices(currentUser(req)!, parsed(res, 'body', priceSheetSchema)));
  });
  return router;
}

/** /api/kits: shoot kits, their items, shares, summary and CSV export. */
export function kitRoutes(planning: PlanningService) {
  const router = Router();
  router.use(requireAuth);
  const kitId = (res: { locals: Record<string, unknown> }) => (res.locals.params as { id: number }).id;
  const itemId = (res: { locals: Record<string, unknown> }) => (res.locals.params as z.output<typeof kitItemParamsSchema>).itemId;
  const kitParams = validate('params', kitParamsSchema);
  const itemParams = validate('params', kitItemParamsSchema);

  router.get('/', async (req, res) => {
    res.json(await planning.listKits(currentUser(req)!));
  });
  router.post('/', validate('body', kitSchema), async (req, res) => {
    const kit = await planning.createKit(currentUser(req)!, parsed(res, 'body', kitSchema));
    res.status(201).location(`/api/kits/${kit.id}`).json(kit);
  });
  router.get('/:id', kitParams, async (req, res) => {
    res.json(await planning.getKit(currentUser(req)!, kitId(res)));
  });
  router.patch('/:id', kitParams, validate('body', kitPatchSchema), async (req, res) => {
    res.json(await planning.updateKit(currentUser(req)!, kitId(res), parsed(res, 'body', kitPatchSchema)));
  });
  router.delete('/:id', kitParams, async (req, res) => {
    await planning.deleteKit(currentUser(req)!, kitId(res));
    res.status(204).end();
  });

  router.post('/:id/items', kitParams, validate('body', kitItemSchema), async (req, res) => {
    const item = await planning.addItem(currentUser(req)!, kitId(res), parsed(res, 'body', kitItemSchema));
    res.status(201).json(item);
  });
  router.patch('/:id/items/:itemId', itemParams, validate('body', kitItemPatchSchema), async (req, res) => {
    res.json(await planning.updateItem(currentUser(req)!, kitId(res), itemId(res), parsed(res, 'body', kitItemPatchSchema)));
  });
  router.delete('/:id/items/:itemId', itemParams, async (req, res) => {
    await planning.deleteItem(currentUser(req)!, kitId(res), itemId(res));
    res.status(204).end();
  });

  router.put('/:id/shares', kitParams, validate('body', kitSharesSchema), async (req, res) => {
    res.json(await planning.setShares(currentUser(req)!, kitId(res), parsed(res, 'body', kitSharesSchema)));
  });

  router.put('/:id/crew-shares', kitParams, validate('body', kitCrewSharesSchema), async (req, res) => {
    res.json(await planning.setCrewShares(currentUser(req)!, kitId(res), parsed(res, 'body', kitCrewSharesSchema)));
  });

  router.delete('/:id/shares/me', kitParams, async (req, res) => {
    await planning.leave(currentUser(req)!, kitId(res));
    res.status(204).end();
  });

  router.get('/:id/summary', kitParams, async (req, res) => {
    res.json(await planning.summary(currentUser(req)!, kitId(res)));
  });
  router.get('/:id/export.csv', kitParams, async (req, res) => {
    const { fileName, body } = await planning.exportCsv(currentUser(req)!, kitId(res));
    res.attachment(fileName);
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('X-Content-Type-Options', 'nosniff');
    res.set('Cache-Control', 'no-store');
    res.send(body);
  });
  return router;
}
