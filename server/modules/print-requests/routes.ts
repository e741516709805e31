import express, { Router } from 'express';
import type { z } from 'zod';
import { printRequestActionParamsSchema, printRequestParamsSchema, printRequestSchema, printRequestStepSchema } from '@shared/schemas/print-requests';
import { currentUser, requireAuth } from '../../middleware/auth';
import { parsed, validate } from '../../middleware/validate';
import type { PrintRequestsService } from './service';

/** /api/print-requests: asking crew mates for prints, the steps, paying back. Only the two sides see a request. */
export function printRequestRoutes(service: PrintRequestsService) {
  const router = Router();
  router.use(requireAuth);
  const id = (res: { locals: Record<string, unknown> }) => (res.locals.params as z.output<typeof printRequestParamsSchema>).id;

  router.get('/', async (req, res) => {
    res.json(await service.list(currentUser(req)!));
  });
  router.get('/printers', async (req, res) => {
    res.json({ items: await service.printers(currentUser(req)!) });
  });
  router.post('/', validate('body', printRequestSchema), async (req, res) => {
    const created = await service.create(currentUser(req)!, parsed(res, 'body', printRequestSchema));
    res.status(201).location(`/api/print-requests/${created.id}`).json(created);
  });
  router.get('/:id', validate('params', printRequestParamsSchema), async (req, res) => {
    res.json(await service.get(currentUser(req)!, id(res)));
  });
  router.post('/:id/checkout', validate('params', printRequestParamsSchema), async (req, res) => {
    res.json(await service.checkout(currentUser(req)!, id(res)));
  });
  router.post('/:id/:action', validate('params', printRequestActionParamsSchema), validate('body', printRequestStepSchema), async (req, res) => {
    const { action } = res.locals.params as z.output<typeof printRequestActionParamsSchema>;
    res.json(await service.step(currentUser(req)!, id(res), action, parsed(res, 'body', printRequestStepSchema).note));
  });
  return router;
}

/**
 * /api/payments/webhook: mounted before the JSON parser, the session and CSRF, because the signature
 * is over the raw bytes and the payments service has no session.
 */
export function paymentWebhookRoutes(service: () => PrintRequestsService) {
  const router = Router();
  router.post('/', express.raw({ type: () => true, limit: '512kb' }), async (req, res) => {
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    res.json(await service().webhook(body, req.get('stripe-signature')));
  });
  return router;
}
