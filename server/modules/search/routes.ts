import { Router } from 'express';
import { searchQuerySchema, type SearchQuery } from '@shared/schemas/search';
import { currentUser } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { audienceOf, searchVisibility } from '../parts/access';
import type { SearchService } from './service';

/** GET /api/search: public, like the shelf itself. */
export function searchRoutes(search: SearchService) {
  const router = Router();
  router.get('/', validate('query', searchQuerySchema), async (req, res) => {
    const visibility = searchVisibility(await audienceOf(currentUser(req)));
    res.json(await search.search(res.locals.query as SearchQuery, visibility));
  });
  return router;
}
