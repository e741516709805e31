import express, { Router } from 'express';
import { printRequestActionParamsSchema, printRequestParamsSchema, printRequestSchema, printRequestStepSchema } from '@shared/schemas/print-requests';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { PrintRequestsService } from './service';

/** /api/print-requests: asking crew mates for prints, the steps, paying back. Only the two sides see a request. */
export function printRequestRoutes(service: PrintRequestsService) {
  const router = Router();
  router.use(requireAuth);
  const params = printRequestParamsSchema;

  router.get('/', async (req, res) => {
    res.json(await service.list(currentUser(req)!));
  });
  router.get('/printers', async (req, res) => {
    res.json({ items: await service.printers(currentUser(req)!) });
  });
  router.post(
    '/',
    handler({ body: printRequestSchema }, async ({ body }, req, res) => {
      const created = await service.create(currentUser(req)!, body);
      res.status(201).location(`/api/print-requests/${created.id}`).json(created);
    }),
  );
  router.get(
    '/:id',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await service.get(currentUser(req)!, params.id));
    }),
  );
  router.post(
    '/:id/checkout',
    handler({ params }, async ({ params }, req, res) => {
      res.json(await service.checkout(currentUser(req)!, params.id));
    }),
  );
  router.post(
    '/:id/:action',
    handler({ params: printRequestActionParamsSchema, body: printRequestStepSchema }, async ({ params, body }, req, res) => {
      res.json(await service.step(currentUser(req)!, params.id, params.action, body.note));
    }),
  );
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
