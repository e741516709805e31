// Answers one search from an index and its documents: text matching through lunr, then filters,
// facets, sorting and paging in memory (the text match is in text-match.ts). No database and no I/O,
// so the benchmark runs it as is.
import { compareProven } from '../../../shared/ranking';
import type lunr from 'lunr';
import { mountStandard } from '../../../shared/catalogue';
import type { SearchResponse, SearchResultItem } from '../../../shared/api/search';
import type { SearchQuery } from '../../../shared/schemas/search';
import { BASE_PHRASES, PhraseTable } from '../../../shared/search/aliases';
import { bodyPhraseEntries, resolveBody, type NamedBody } from '../../../shared/search/bodies';
import { countFacets, dimensionCloseness, matchesFilters, type SearchFilters } from '../../../shared/search/filters';
import { readQueryText } from '../../../shared/search/query';
import { AppError } from '../../errors';
import type { SearchDocument } from './index-builder';
import { Budget, compactPostings, plainMatches, syntaxMatches, type Match } from './text-match';

export { Budget, MAX_EXPANSIONS, PREFIX_FROM, readSyntax, TYPO_RULES, type Match } from './text-match';

export interface Searchable {
  index: lunr.Index;
  documents: readonly SearchDocument[];
  /** Every camera body the shelf knows (also those no part names yet); from the documents if left out. */
  bodies?: readonly NamedBody[];
}

/** What ratings and set reports say about a part; refreshed apart from the text index. */
export interface Rank {
  proven: number;
  reports: number;
  heldUp: number;
  mean: number | null;
  count: number;
  adjusted: number | null;
}
export type Ranks = ReadonlyMap<number, Rank>;
const UNRANKED: Rank = { proven: 0, reports: 0, heldUp: 0, mean: null, count: 0, adjusted: null };

/**
 * Which crew-only documents a search may see: 'all' for moderators, else the searcher's crews. The
 * rest are dropped before filters, counts and facets, so nothing about them shows.
 */
export interface CrewVisibility {
  crews: 'all' | readonly number[];
}
export const PUBLIC_ONLY: CrewVisibility = { crews: [] };

export function visibleTo(doc: SearchDocument, visibility: CrewVisibility): boolean {
  if (doc.crewId == null || visibility.crews === 'all') return true;
  return visibility.crews.includes(doc.crewId);
}

export interface Searcher {
  search(query: SearchQuery, ranks?: Ranks, visibility?: CrewVisibility): SearchResponse;
  readonly size: number;
  readonly documents: readonly SearchDocument[];
}

const newestFirst = (a: SearchDocument, b: SearchDocument) => (a.publishedAt < b.publishedAt ? 1 : a.publishedAt > b.publishedAt ? -1 : b.id - a.id);

function present(m: Match, ranks: Ranks, groupTexts: readonly string[]): SearchResultItem {
  const { doc } = m;
  const rank = ranks.get(doc.id) ?? UNRANKED;
  const hit = new Set(m.groups ?? []);
  return {
    id: doc.id,
    slug: doc.slug,
    title: doc.title,
    summary: doc.summary,
    sizeMm: doc.sizeMm ? [doc.sizeMm[0], doc.sizeMm[1], doc.sizeMm[2]] : null,
    mounts: doc.mounts.map((mount) => ({
      slug: mount.slug,
      label: mountStandard(mount.slug)?.label ?? mount.slug,
      ...(mount.note ? { note: mount.note } : {}),
    })),
    bodies: doc.bodies.map((b) => ({ slug: b.slug, maker: b.maker, model: b.model })),
    rating: rank.mean,
    ratingCount: rank.count,
    proven: rank.proven,
    reports: rank.reports,
    heldUp: rank.heldUp,
    thumbnail: doc.thumbnail,
    score: Math.round(m.score * 1e4) / 1e4,
    matched: groupTexts.filter((_, i) => hit.has(i)),
    missing: m.groups ? groupTexts.filter((_, i) => !hit.has(i)) : [],
    ...(doc.crewId != null ? { crewOnly: true } : {}),
  };
}

export function sortNewestFirst(documents: readonly SearchDocument[]): SearchDocument[] {
  return [...documents].sort(newestFirst);
}

/** What the text part of a search handed on: the groups typed, for matched / missing on each result. */
export interface TextContext {
  ranked: boolean;
  groupTexts: readonly string[];
}

/**
 * Everything after the text match: filters, facets over all matches, order and the page. Without
 * text (`ranked` false) the matches must come newest first already. Whatever the sort, parts that
 * match more of the typed groups come first (coordination); by relevance, then the closest key
 * dimension, then lunr's score.
 */
export function filterAndPage(matches: Match[], query: SearchQuery & SearchFilters, text: TextContext | boolean, ranks: Ranks = new Map()): SearchResponse {
  const ctx: TextContext = typeof text === 'boolean' ? { ranked: text, groupTexts: [] } : text;
  const filtered = matches.filter((m) => matchesFilters(m.doc, query));
  const rankOf = (m: Match) => ranks.get(m.doc.id) ?? UNRANKED;
  const coordination = (a: Match, b: Match) => (b.groups?.length ?? 0) - (a.groups?.length ?? 0);
  const dims = query.dim ?? [];
  const closeness = new Map<Match, number>();
  if (dims.length) for (const m of filtered) closeness.set(m, dimensionCloseness(m.doc.keyDimensions, dims));
  const closer = (a: Match, b: Match) => (dims.length ? closeness.get(a)! - closeness.get(b)! : 0);
  if (query.sort === 'proven') {
    // best proven on set, then the adjusted rating, then relevance: one perfect report never beats forty good ones
    filtered.sort(
      (a, b) =>
        coordination(a, b) ||
        compareProven(
          { provenScore: rankOf(a).proven, adjustedRating: rankOf(a).adjusted ?? 0 },
          { provenScore: rankOf(b).proven, adjustedRating: rankOf(b).adjusted ?? 0 },
        ) ||
        b.score - a.score ||
        newestFirst(a.doc, b.doc),
    );
  } else if (query.sort === 'newest') {
    if (ctx.ranked) filtered.sort((a, b) => coordination(a, b) || newestFirst(a.doc, b.doc));
  } else if (ctx.ranked || dims.length) {
    filtered.sort((a, b) => coordination(a, b) || closer(a, b) || b.score - a.score || newestFirst(a.doc, b.doc));
  }
  const start = (query.page - 1) * query.pageSize;
  return {
    total: filtered.length,
    page: query.page,
    pageSize: query.pageSize,
    facets: countFacets(filtered.map((m) => m.doc)),
    results: filtered.slice(start, start + query.pageSize).map((m) => present(m, ranks, ctx.groupTexts)),
  };
}

/** Every body named by the documents, when the caller passes no list of its own. */
function bodiesOf(documents: readonly SearchDocument[]): NamedBody[] {
  const bySlug = new Map<string, NamedBody>();
  for (const d of documents) for (const b of d.bodies) if (!bySlug.has(b.slug)) bySlug.set(b.slug, b);
  return [...bySlug.values()];
}

export function createSearcher({ index, documents, bodies = bodiesOf(documents) }: Searchable): Searcher {
  const byRef = new Map(documents.map((d) => [String(d.id), d]));
  const postings = compactPostings(index, new Map(documents.map((d, i) => [String(d.id), i])));
  const everything: Match[] = sortNewestFirst(documents).map((doc) => ({ doc, score: 0 }));
  const phrases = new PhraseTable([...BASE_PHRASES, ...bodyPhraseEntries(bodies)]);
  const hasCrewOnly = documents.some((d) => d.crewId != null);

  /** Body filter values (slugs or names) as slugs; an unknown name is a 400 naming the closest bodies. */
  function bodyFilter(values: readonly string[]): string[] {
    if (!values.length) return [];
    return values.map((value) => {
      const found = resolveBody(value, bodies);
      if (found.ok) return found.slug;
      const hint = found.closest.length ? ` Closest known: ${found.closest.join(', ')}.` : '';
      throw AppError.badRequest(`No camera body is called "${value}".${hint}`, { body: `Unknown camera body "${value}".${hint}` });
    });
  }

  return {
    size: documents.length,
    documents,
    search(query, ranks, visibility = PUBLIC_ONLY) {
      const filters = { ...query, body: bodyFilter(query.body) };
      const text = readQueryText(query.q, phrases);
      const budget = new Budget();
      let matches: Match[];
      let groupTexts: string[] = [];
      if (text.kind === 'none') matches = everything;
      else if (text.kind === 'plain') {
        matches = plainMatches(index, text.groups, documents, postings, budget);
        groupTexts = text.groups.map((g) => g.text);
      } else matches = syntaxMatches(index, text.text, query.q ?? '', byRef, budget);
      if (hasCrewOnly) matches = matches.filter((m) => visibleTo(m.doc, visibility));
      return filterAndPage(matches, filters, { ranked: text.kind !== 'none', groupTexts }, ranks);
    },
  };
}
