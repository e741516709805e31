// Answers one search from an index and its documents: text matching through lunr, then filters,
// facets, sorting and paging in memory. No database and no I/O, so the benchmark runs it as is.
import { compareProven } from '../../../shared/ranking';
import lunr from 'lunr';
import { mountStandard } from '../../../shared/catalogue';
import type { SearchResponse, SearchResultItem } from '../../../shared/api/search';
import type { SearchQuery } from '../../../shared/schemas/search';
import { mountToken } from '../../../shared/search/aliases';
import { countFacets, matchesFilters } from '../../../shared/search/filters';
import { allowedEditDistance, MAX_TERMS, readQueryText, SEARCH_LIMITS, type TermGroup } from '../../../shared/search/query';
import { AppError } from '../../errors';
import { SEARCH_FIELDS, type SearchDocument } from './index-builder';

/** What lunr keeps inside an index that its type declarations leave out. */
interface IndexInternals {
  invertedIndex: Record<string, unknown>;
  tokenSet: lunr.TokenSet;
  pipeline: lunr.Pipeline;
}
// @types/lunr declares these constructors as instance methods
const TokenSet = lunr.TokenSet as unknown as {
  fromString(text: string): lunr.TokenSet;
  fromFuzzyString(text: string, editDistance: number): lunr.TokenSet;
};

/**
 * Typo tolerance, for words the shelf does not know: one edit (insertion, deletion, substitution
 * or swap of neighbours) from 5 letters, two edits from 7 letters when one finds nothing. Words
 * the index holds are taken as typed, so "plate" never drifts to "place".
 */
export const TYPO_RULES = { oneEditFrom: 5, twoEditsFrom: 7 } as const;
/** The last word also matches as a prefix (the crew member may still be typing) from this length. */
export const PREFIX_FROM = 3;
/** At most this many words per prefix, shortest first, so "a" does not expand to the whole shelf. */
export const MAX_EXPANSIONS = SEARCH_LIMITS.maxExpansions;

/** Throws once a search has run longer than its budget (checked between the costly steps). */
export class Budget {
  private readonly until: number;
  constructor(ms: number = SEARCH_LIMITS.budgetMs) {
    this.until = performance.now() + ms;
  }
  check() {
    if (performance.now() > this.until) {
      throw new AppError(503, 'search_too_costly', 'This search took too long. Use fewer words with wildcards (*) or typos (~), then try again.');
    }
  }
}

const shortestFirst = (a: string, b: string) => a.length - b.length || (a < b ? -1 : 1);

const BOOST = { exact: 1, prefix: 0.5, oneEdit: 0.4, twoEdits: 0.25, mountWord: 0.5 } as const;

export interface Searchable {
  index: lunr.Index;
  documents: readonly SearchDocument[];
}

/** What ratings and set reports say about a part; refreshed apart from the text index. */
export interface Rank {
  proven: number;
  reports: number;
  mean: number | null;
  count: number;
  adjusted: number | null;
}
export type Ranks = ReadonlyMap<number, Rank>;
const UNRANKED: Rank = { proven: 0, reports: 0, mean: null, count: 0, adjusted: null };

export interface Searcher {
  search(query: SearchQuery, ranks?: Ranks): SearchResponse;
  readonly size: number;
  readonly documents: readonly SearchDocument[];
}

export interface Match {
  doc: SearchDocument;
  score: number;
}

/** Terms of the index one group of the query may match, with the boost each gets. */
function expandGroup(index: lunr.Index, group: TermGroup): Map<string, number> {
  const internals = index as unknown as IndexInternals;
  const has = (term: string) => Object.prototype.hasOwnProperty.call(internals.invertedIndex, term);
  const terms = new Map<string, number>();
  const add = (term: string, boost: number) => {
    if (!terms.has(term) && has(term)) terms.set(term, boost);
  };
  const stem = (word: string) => internals.pipeline.runString(word)[0] ?? word;

  if (group.kind === 'mount') {
    add(mountToken(group.mount!), BOOST.exact);
    if (group.alsoWord) add(stem(group.text), BOOST.mountWord);
    return terms;
  }

  const word = group.text;
  const stemmed = stem(word);
  add(stemmed, BOOST.exact);
  add(word, BOOST.exact);
  // a last word that is already a word of the shelf is taken as typed; only a partial one expands
  if (group.last && word.length >= PREFIX_FROM && terms.size === 0) {
    const prefixed = internals.tokenSet.intersect(TokenSet.fromString(`${word}*`)).toArray();
    prefixed.sort((a, b) => a.length - b.length || (a < b ? -1 : 1));
    for (const term of prefixed.slice(0, MAX_EXPANSIONS)) add(term, BOOST.prefix);
  }
  if (terms.size === 0 && word.length >= TYPO_RULES.oneEditFrom && allowedEditDistance(1, stemmed.length) === 1) {
    const fuzzy = (distance: number) => internals.tokenSet.intersect(TokenSet.fromFuzzyString(stemmed, distance)).toArray().sort(shortestFirst);
    for (const term of fuzzy(1).slice(0, MAX_EXPANSIONS)) add(term, BOOST.oneEdit);
    if (terms.size === 0 && word.length >= TYPO_RULES.twoEditsFrom && allowedEditDistance(2, stemmed.length) === 2) {
      for (const term of fuzzy(2).slice(0, MAX_EXPANSIONS)) add(term, BOOST.twoEdits);
    }
  }
  return terms;
}

/**
 * Plain words: every word (or mount name) must match, each through any of its expansions. A word
 * with a single expansion is marked required, so lunr scores only documents that have it; for the
 * others (prefix, typo) lunr scores the expansions together and the check that each group matched
 * is ours, from the match data.
 */
function plainMatches(index: lunr.Index, groups: TermGroup[], byRef: Map<string, SearchDocument>): Match[] {
  const expanded = groups.map((g) => expandGroup(index, g));
  if (expanded.some((terms) => terms.size === 0)) return [];
  const results = index.query((q) => {
    for (const terms of expanded) {
      const presence = terms.size === 1 ? lunr.Query.presence.REQUIRED : lunr.Query.presence.OPTIONAL;
      for (const [term, boost] of terms) q.term(term, { usePipeline: false, boost, presence });
    }
  });
  const open = expanded.filter((terms) => terms.size > 1).map((terms) => [...terms.keys()]);
  const matches: Match[] = [];
  for (const result of results) {
    const matched = result.matchData.metadata as Record<string, unknown>;
    if (!open.every((terms) => terms.some((t) => t in matched))) continue;
    const doc = byRef.get(result.ref);
    if (doc) matches.push({ doc, score: result.score });
  }
  return matches;
}

const SYNTAX_HELP =
  `Search understands plain words, or the query syntax field:word (fields: ${SEARCH_FIELDS.join(', ')}), ` +
  '+word (must have), -word (must not have), word~1 (one typo allowed, at most ~2), word^2 (counts double) and batt* (starts with; at least two letters first, at most two * per search).';

function syntaxError(original: string, problem: string): AppError {
  return AppError.badRequest(`The search "${original}" could not be read: ${problem}. ${SYNTAX_HELP}`, { q: problem });
}

/** A parsed clause; @types/lunr leaves `presence` out. */
type Clause = lunr.Query.Clause & { presence?: lunr.Query.presence };

// @types/lunr leaves the parser out
const QueryParser = (lunr as unknown as { QueryParser: new (text: string, query: lunr.Query) => { parse(): void } }).QueryParser;

/**
 * Reads query syntax into clauses and holds it to SEARCH_LIMITS: edit distances capped (and
 * lowered for long words), at most a few wildcards, each after some letters, at most MAX_TERMS
 * clauses. Refusals are 400s a person can act on; capped distances are applied quietly.
 */
export function readSyntax(text: string, original: string, fields: readonly string[] = SEARCH_FIELDS): Clause[] {
  const query = new lunr.Query([...fields]);
  try {
    new QueryParser(text, query).parse();
  } catch (err) {
    if (err instanceof lunr.QueryParseError) throw syntaxError(original, err.message);
    throw err;
  }
  if (query.clauses.length > MAX_TERMS) throw syntaxError(original, `it has ${query.clauses.length} words; use at most ${MAX_TERMS}`);
  let wildcards = 0;
  for (const clause of query.clauses) {
    const stars = clause.term.split('*').length - 1;
    wildcards += stars;
    if (stars && clause.term.indexOf('*') < SEARCH_LIMITS.minWildcardPrefix) {
      throw syntaxError(original, `put at least ${SEARCH_LIMITS.minWildcardPrefix} letters before a * ("${clause.term}"), like batt*`);
    }
    if (clause.editDistance) clause.editDistance = allowedEditDistance(clause.editDistance, clause.term.length);
  }
  if (wildcards > SEARCH_LIMITS.maxWildcards) throw syntaxError(original, `it has ${wildcards} wildcards (*); use at most ${SEARCH_LIMITS.maxWildcards}`);
  return query.clauses as Clause[];
}

/**
 * Query syntax, with the expansion done here instead of inside lunr so each clause stands for at
 * most MAX_EXPANSIONS index terms and the budget is checked between clauses. A required clause
 * with several expansions needs any one of them: it is sent as optional terms and checked after.
 */
function syntaxMatches(index: lunr.Index, text: string, original: string, byRef: Map<string, SearchDocument>, budget: Budget): Match[] {
  const internals = index as unknown as IndexInternals;
  const clauses = readSyntax(text, original);
  const expanded: Clause[] = [];
  const anyOf: string[][] = [];
  for (const clause of clauses) {
    budget.check();
    const words = clause.usePipeline ? (internals.pipeline as unknown as { runString(s: string, meta: object): string[] }).runString(clause.term, { fields: clause.fields }) : [clause.term];
    const terms = new Set<string>();
    for (const word of words) {
      const automaton = clause.editDistance ? TokenSet.fromFuzzyString(word, clause.editDistance) : TokenSet.fromString(word);
      for (const term of internals.tokenSet.intersect(automaton).toArray()) terms.add(term);
    }
    const kept = [...terms].sort(shortestFirst).slice(0, MAX_EXPANSIONS);
    const required = clause.presence === lunr.Query.presence.REQUIRED;
    if (required && kept.length === 0) return [];
    if (required && kept.length > 1) anyOf.push(kept);
    for (const term of kept) {
      // no editDistance key at all: lunr reads its presence as "fuzzy"
      expanded.push({
        term,
        fields: clause.fields,
        boost: clause.boost,
        usePipeline: false,
        wildcard: lunr.Query.wildcard.NONE,
        presence: required && kept.length > 1 ? lunr.Query.presence.OPTIONAL : clause.presence,
      } as Clause);
    }
  }
  budget.check();
  // lunr reads a query of only "must not" clauses (or none) as "everything except": when the
  // positive words expanded to nothing, nothing matches
  const positive = (c: Clause) => c.presence !== lunr.Query.presence.PROHIBITED;
  if (clauses.some(positive) && !expanded.some(positive)) return [];
  // a term holding "*" would be read as a wildcard again; such index terms are rare and skipped
  const results = index.query((q) => {
    for (const clause of expanded) if (!clause.term.includes('*')) q.clause(clause);
  });
  return results.flatMap((r) => {
    const matched = r.matchData.metadata as Record<string, unknown>;
    if (!anyOf.every((terms) => terms.some((t) => t in matched))) return [];
    const doc = byRef.get(r.ref);
    return doc ? [{ doc, score: r.score }] : [];
  });
}

const newestFirst = (a: SearchDocument, b: SearchDocument) => (a.publishedAt < b.publishedAt ? 1 : a.publishedAt > b.publishedAt ? -1 : b.id - a.id);

function present(m: Match, ranks: Ranks): SearchResultItem {
  const { doc } = m;
  const rank = ranks.get(doc.id) ?? UNRANKED;
  return {
    id: doc.id,
    slug: doc.slug,
    title: doc.title,
    summary: doc.summary,
    sizeMm: doc.sizeMm ? [doc.sizeMm[0], doc.sizeMm[1], doc.sizeMm[2]] : null,
    mounts: doc.mounts.map((mount) => ({ slug: mount.slug, label: mountStandard(mount.slug)?.label ?? mount.slug, ...(mount.note ? { note: mount.note } : {}) })),
    bodies: doc.bodies.map((b) => ({ slug: b.slug, maker: b.maker, model: b.model })),
    rating: rank.mean,
    ratingCount: rank.count,
    proven: rank.proven,
    reports: rank.reports,
    thumbnail: doc.thumbnail,
    score: Math.round(m.score * 1e4) / 1e4,
  };
}

export function sortNewestFirst(documents: readonly SearchDocument[]): SearchDocument[] {
  return [...documents].sort(newestFirst);
}

/**
 * Everything after the text match: filters, facets over all matches, order and the page. Without
 * text (`ranked` false) the matches must come newest first already.
 */
export function filterAndPage(matches: Match[], query: SearchQuery, ranked: boolean, ranks: Ranks = new Map()): SearchResponse {
  const filtered = matches.filter((m) => matchesFilters(m.doc, query));
  const rankOf = (m: Match) => ranks.get(m.doc.id) ?? UNRANKED;
  if (query.sort === 'proven') {
    // best proven on set, then the adjusted rating, then relevance: one perfect report never beats forty good ones
    filtered.sort(
      (a, b) =>
        compareProven({ provenScore: rankOf(a).proven, adjustedRating: rankOf(a).adjusted ?? 0 }, { provenScore: rankOf(b).proven, adjustedRating: rankOf(b).adjusted ?? 0 }) ||
        b.score - a.score ||
        newestFirst(a.doc, b.doc),
    );
  } else if (ranked) {
    if (query.sort === 'newest') filtered.sort((a, b) => newestFirst(a.doc, b.doc));
    else filtered.sort((a, b) => b.score - a.score || newestFirst(a.doc, b.doc));
  }
  const start = (query.page - 1) * query.pageSize;
  return {
    total: filtered.length,
    page: query.page,
    pageSize: query.pageSize,
    facets: countFacets(filtered.map((m) => m.doc)),
    results: filtered.slice(start, start + query.pageSize).map((m) => present(m, ranks)),
  };
}

export function createSearcher({ index, documents }: Searchable): Searcher {
  const byRef = new Map(documents.map((d) => [String(d.id), d]));
  const everything: Match[] = sortNewestFirst(documents).map((doc) => ({ doc, score: 0 }));

  return {
    size: documents.length,
    documents,
    search(query, ranks) {
      const text = readQueryText(query.q);
      const budget = new Budget();
      let matches: Match[];
      if (text.kind === 'none') matches = everything;
      else if (text.kind === 'plain') matches = plainMatches(index, text.groups, byRef);
      else matches = syntaxMatches(index, text.text, query.q ?? '', byRef, budget);
      return filterAndPage(matches, query, text.kind !== 'none', ranks);
    },
  };
}
