import { Router } from 'express';
import { searchQuerySchema, type SearchQuery } from '@shared/schemas/search';
import { validate } from '../../middleware/validate';
import type { SearchService } from './service';

/** GET /api/search: public, like the shelf itself. */
export function searchRoutes(search: SearchService) {
  const router = Router();
  router.get('/', validate('query', searchQuerySchema), async (_req, res) => {
    res.json(await search.search(res.locals.query as SearchQuery));
  });
  return router;
}
