// The search service's worker threads: a search past its time stops its worker, which is replaced
// from the saved index file, and the next search is answered again.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { searchQuerySchema } from '@shared/schemas/search';
import { AppError } from '../../server/errors';
import { createSearchService } from '../../server/modules/search/service';
import { createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, { demo: true });
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

describe('search service · a search past its time', () => {
  it('search service · a search past its time · 503, its worker replaced from the saved file, serving goes on', async () => {
    // no time at all: the first search cannot come back in time
    const service = createSearchService({ sequelize: t.sequelize, indexFile: t.config.SEARCH_INDEX_FILE, queryTimeoutMs: 0 });
    try {
      await service.start();
      expect(service.stats()).toMatchObject({ loadsFromFile: 1, source: 'file' });
      const caught = await service.search(searchQuerySchema.parse({ q: 'receiver' })).catch((err: unknown) => err);
      expect(caught).toBeInstanceOf(AppError);
      expect(caught).toMatchObject({ status: 503, code: 'search_too_costly' });
      await service.idle();
      // a fresh worker loaded the saved index in place of the stopped one
      expect(service.stats()).toMatchObject({ loadsFromFile: 2, documents: t.services.search.stats().documents });
    } finally {
      await service.close();
    }
  });

  it("search service · any search · answered by the app's worker; the index never shares the main thread", async () => {
    const res = await t.services.search.search(searchQuerySchema.parse({ q: 'receiver plate' }));
    expect(res.results[0]).toMatchObject({ slug: 'receiver-cradle-for-15-mm-rods', matched: ['receiver'], missing: ['plate'] });
  });
});
