// GET /api/search?build=<id>: the same search, with the member's build deciding the order. Parts
// that fit the build come first, then those that may fit, then the rest, each marked with the
// verdict and its reasons (shared/build-fit.ts). Without `build` the plain search route answers.
//
// The text search ranks the whole shelf; this re-orders its best FIT_WINDOW matches by fit and keeps
// relevance inside each verdict. Parts that match only some of the typed words stay behind those
// that match all of them. Matches beyond the window keep their relevance order after it.
import type { NextFunction, Request, Response } from 'express';
import { Router } from 'express';
import { Op } from 'sequelize';
import { z } from 'zod';
import type { BuildSearchResponse, BuildSearchResultItem } from '@shared/api/builds';
import type { SearchResponse, SearchResultItem } from '@shared/api/search';
import { fitPartToBuild, FIT_ORDER, type FitBuild, type FitSize, type FitVerdict } from '@shared/build-fit';
import { mountStandard } from '@shared/catalogue';
import { buildIdSchema } from '@shared/schemas/builds';
import { searchQuerySchema, type SearchQuery } from '@shared/schemas/search';
import { Part, PartRevision } from '../../db/models';
import { AppError } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { audienceOf, searchVisibility } from '../parts/access';
import { buildsService } from '../builds/service';
import type { CrewVisibility } from './searcher';

export const FIT_WINDOW = 300;

const buildParam = z.object({ build: buildIdSchema });

interface Searching {
  search(query: SearchQuery, visibility?: CrewVisibility): SearchResponse | Promise<SearchResponse>;
}

/** Key dimensions of the published revisions of the given parts (search results do not carry them). */
async function keyDimensionsOf(partIds: number[]): Promise<Map<number, FitSize[]>> {
  if (!partIds.length) return new Map();
  const parts = await Part.findAll({
    where: { id: { [Op.in]: partIds } },
    attributes: ['id', 'publishedRevisionId'],
    include: [{ model: PartRevision, as: 'publishedRevision', attributes: ['id', 'keyDimensions'] }],
  });
  return new Map(
    parts.map((p) => [
      p.id,
      (p.publishedRevision?.keyDimensions ?? []).map((d) => ({ name: d.name, valueMm: Number(d.valueMm), tolMm: Number(d.tolMm ?? 0) })),
    ]),
  );
}

export function buildSearchRoutes(search: Searching) {
  const router = Router();
  router.get('/', async (req: Request, res: Response, next: NextFunction) => {
    const raw = req.query as Record<string, unknown>;
    if (raw.build === undefined) return next();
    const user = currentUser(req);
    if (!user) throw AppError.unauthorized('Sign in to search with one of your builds, or leave out build=.');
    const idParsed = buildParam.safeParse({ build: Array.isArray(raw.build) ? raw.build[0] : raw.build });
    if (!idParsed.success) throw AppError.validation(idParsed.error);
    const { build: _omit, ...rest } = raw;
    const parsedQuery = searchQuerySchema.safeParse(rest);
    if (!parsedQuery.success) throw AppError.validation(parsedQuery.error);
    const query = parsedQuery.data;

    const build = await buildsService.find(user, idParsed.data.build);
    const fitBuild: FitBuild = { body: build.body?.slug ?? null, mounts: build.mounts, keySizes: build.keySizes };
    const bodyLabel = new Map<string, string>();
    const labels = { body: (slug: string) => bodyLabel.get(slug) ?? slug, mount: (slug: string) => mountStandard(slug)?.label ?? slug };
    if (build.body) bodyLabel.set(build.body.slug, `${build.body.maker} ${build.body.model}`);

    const visibility = searchVisibility(await audienceOf(user));
    const window = await search.search({ ...query, page: 1, pageSize: FIT_WINDOW }, visibility);
    const start = (query.page - 1) * query.pageSize;
    const beyond = start >= window.results.length && window.total > window.results.length;
    const pool: SearchResultItem[] = beyond ? (await search.search(query, visibility)).results : window.results;
    const dims = await keyDimensionsOf(pool.map((r) => r.id));
    const marked: BuildSearchResultItem[] = pool.map((r) => {
      for (const b of r.bodies) if (!bodyLabel.has(b.slug)) bodyLabel.set(b.slug, `${b.maker} ${b.model}`);
      const fit = fitPartToBuild(
        { bodies: r.bodies.map((b) => b.slug), mounts: r.mounts.map((m) => m.slug), keyDimensions: dims.get(r.id) ?? [] },
        fitBuild,
        labels,
      );
      return { ...r, fit: { verdict: fit.verdict, summary: fit.summary, reasons: fit.reasons } };
    });
    const fitCounts: Record<FitVerdict, number> = { fits: 0, 'may-fit': 0, not: 0 };
    let page: BuildSearchResultItem[];
    if (beyond) page = marked;
    else {
      // parts matching every typed word stay ahead of partial matches; within each, fit decides,
      // then the search's own order (a stable sort)
      const partial = (r: BuildSearchResultItem) => (r.missing?.length ? 1 : 0);
      const ordered = marked
        .map((r, i) => ({ r, i }))
        .sort((a, b) => partial(a.r) - partial(b.r) || FIT_ORDER[a.r.fit.verdict] - FIT_ORDER[b.r.fit.verdict] || a.i - b.i)
        .map((x) => x.r);
      for (const r of ordered) fitCounts[r.fit.verdict] += 1;
      page = ordered.slice(start, start + query.pageSize);
    }
    const answer: BuildSearchResponse = {
      total: window.total,
      page: query.page,
      pageSize: query.pageSize,
      facets: window.facets,
      build: { id: build.id, name: build.name },
      rankedByFit: beyond ? 0 : marked.length,
      fitCounts,
      results: page,
    };
    res.json(answer);
  });
  return router;
}
