import { Router } from 'express';
import { searchQuerySchema } from '@shared/schemas/search';
import { currentUser } from '../../middleware/auth';
import { handler } from '../../middleware/validate';
import { audienceOf, searchVisibility } from '../parts/access';
import type { SearchService } from './service';

/** GET /api/search: public, like the shelf itself. */
export function searchRoutes(search: SearchService) {
  const router = Router();
  router.get(
    '/',
    handler({ query: searchQuerySchema }, async ({ query }, req, res) => {
      const visibility = searchVisibility(await audienceOf(currentUser(req)));
      res.json(await search.search(query, visibility));
    }),
  );
  return router;
}
