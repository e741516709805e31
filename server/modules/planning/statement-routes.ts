import { Router } from 'express';
import { kitParamsSchema } from '@shared/schemas/planning';
import { statementDetailsSchema, statementQuerySchema } from '@shared/schemas/print-requests';
import { currentUser, requireAuth } from '../../middleware/auth';
import { parsed, validate } from '../../middleware/validate';
import type { PlanningService } from './service';
import { loadStatement, saveStatementDetails, statementCsv, statementFileName, statementPdf } from './statement';

/** /api/kits/:id/statement(.csv|.pdf): what the kit costs, for the production office. */
export function statementRoutes(planning: PlanningService) {
  const router = Router();
  const kitParams = validate('params', kitParamsSchema);
  const query = validate('query', statementQuerySchema);
  const load = (req: Parameters<Parameters<typeof router.get>[1]>[0], res: { locals: Record<string, unknown> }) =>
    loadStatement(planning, currentUser(req)!, (res.locals.params as { id: number }).id, parsed(res, 'query', statementQuerySchema).crewId);

  router.get('/:id/statement', requireAuth, kitParams, query, async (req, res) => {
    res.json(await load(req, res));
  });
  router.put('/:id/statement', requireAuth, kitParams, validate('body', statementDetailsSchema), async (req, res) => {
    await saveStatementDetails(currentUser(req)!, (res.locals.params as { id: number }).id, parsed(res, 'body', statementDetailsSchema));
    res.status(204).end();
  });
  router.get('/:id/statement.csv', requireAuth, kitParams, query, async (req, res) => {
    const s = await load(req, res);
    res.attachment(statementFileName(s, 'csv'));
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('X-Content-Type-Options', 'nosniff');
    res.set('Cache-Control', 'no-store');
    res.send(statementCsv(s));
  });
  router.get('/:id/statement.pdf', requireAuth, kitParams, query, async (req, res) => {
    const s = await load(req, res);
    const pdf = await statementPdf(s);
    res.attachment(statementFileName(s, 'pdf'));
    res.set('Content-Type', 'application/pdf');
    res.set('Cache-Control', 'no-store');
    res.send(pdf);
  });
  return router;
}
