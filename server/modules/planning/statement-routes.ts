import { Router } from 'express';
import { kitParamsSchema } from '@shared/schemas/planning';
import { statementDetailsSchema, statementQuerySchema } from '@shared/schemas/print-requests';
import { currentUser, requireAuth } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import type { PlanningService } from './service';
import { loadStatement, saveStatementDetails, statementCsv, statementFileName, statementPdf } from './statement';

/** /api/kits/:id/statement(.csv|.pdf): what the kit costs, for the production office. */
export function statementRoutes(planning: PlanningService) {
  const router = Router();
  const read = { params: kitParamsSchema, query: statementQuerySchema };

  router.get(
    '/:id/statement',
    requireAuth,
    handler(read, async ({ params, query }, req, res) => {
      res.json(await loadStatement(planning, currentUser(req)!, params.id, query.crewId));
    }),
  );
  router.put(
    '/:id/statement',
    requireAuth,
    handler({ params: kitParamsSchema, body: statementDetailsSchema }, async ({ params, body }, req, res) => {
      await saveStatementDetails(currentUser(req)!, params.id, body);
      res.status(204).end();
    }),
  );
  router.get(
    '/:id/statement.csv',
    requireAuth,
    handler(read, async ({ params, query }, req, res) => {
      const s = await loadStatement(planning, currentUser(req)!, params.id, query.crewId);
      res.attachment(statementFileName(s, 'csv'));
      res.set('Content-Type', 'text/csv; charset=utf-8');
      res.set('X-Content-Type-Options', 'nosniff');
      res.set('Cache-Control', 'no-store');
      res.send(statementCsv(s));
    }),
  );
  router.get(
    '/:id/statement.pdf',
    requireAuth,
    handler(read, async ({ params, query }, req, res) => {
      const s = await loadStatement(planning, currentUser(req)!, params.id, query.crewId);
      const pdf = await statementPdf(s);
      res.attachment(statementFileName(s, 'pdf'));
      res.set('Content-Type', 'application/pdf');
      res.set('Cache-Control', 'no-store');
      res.send(pdf);
    }),
  );
  return router;
}
