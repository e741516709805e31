// The text part of a search: which parts match the typed words (plain words with prefixes, typos,
// hyphenated words and trade phrases) or the query syntax, scored like lunr. Split from searcher.ts,
// which adds filters, facets, order and paging.
import lunr from 'lunr';
import { allowedEditDistance, MAX_TERMS, SEARCH_LIMITS, type TermGroup } from '../../../shared/search/query';
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

export interface Match {
  doc: SearchDocument;
  score: number;
  /** Indexes of the query groups the part matched (plain text only). */
  groups?: number[];
}

/** Index terms that may stand for a slot, each with its boost; a slot is met when any is present. */
type Slot = Map<string, number>;
/** One way to match a group: every slot met. */
type Alternative = Slot[];

function internalsOf(index: lunr.Index) {
  const internals = index as unknown as IndexInternals;
  const has = (term: string) => Object.prototype.hasOwnProperty.call(internals.invertedIndex, term);
  const stem = (word: string) => internals.pipeline.runString(word)[0] ?? word;
  return { internals, has, stem };
}

/** The index terms one typed word stands for: as typed and stemmed, else as a prefix or with typos. */
function wordSlot(index: lunr.Index, word: string, last: boolean, budget: Budget): Slot {
  const { internals, has, stem } = internalsOf(index);
  const terms: Slot = new Map();
  const add = (term: string, boost: number) => {
    if (!terms.has(term) && has(term)) terms.set(term, boost);
  };
  const stemmed = stem(word);
  add(stemmed, BOOST.exact);
  add(word, BOOST.exact);
  // a last word that is already a word of the shelf is taken as typed; only a partial one expands
  if (last && word.length >= PREFIX_FROM && terms.size === 0) {
    budget.check();
    const prefixed = internals.tokenSet.intersect(TokenSet.fromString(`${word}*`)).toArray();
    prefixed.sort(shortestFirst);
    for (const term of prefixed.slice(0, MAX_EXPANSIONS)) add(term, BOOST.prefix);
  }
  if (terms.size === 0 && word.length >= TYPO_RULES.oneEditFrom && allowedEditDistance(1, stemmed.length) === 1) {
    budget.check();
    const fuzzy = (distance: number) => internals.tokenSet.intersect(TokenSet.fromFuzzyString(stemmed, distance)).toArray().sort(shortestFirst);
    for (const term of fuzzy(1).slice(0, MAX_EXPANSIONS)) add(term, BOOST.oneEdit);
    if (terms.size === 0 && word.length >= TYPO_RULES.twoEditsFrom && allowedEditDistance(2, stemmed.length) === 2) {
      budget.check();
      for (const term of fuzzy(2).slice(0, MAX_EXPANSIONS)) add(term, BOOST.twoEdits);
    }
  }
  return terms;
}

/** The ways one group of the query can match; none when the shelf has none of its terms. */
function expandGroup(index: lunr.Index, group: TermGroup, budget: Budget): Alternative[] {
  const { has, stem } = internalsOf(index);
  const alternatives: Alternative[] = [];
  const single = (term: string, boost: number) => {
    if (has(term)) alternatives.push([new Map([[term, boost]])]);
  };
  if (group.kind !== 'word') {
    for (const token of group.tokens ?? []) single(token, BOOST.exact);
    if (group.alsoWord) single(stem(group.text), BOOST.mountWord);
  } else if (group.parts) {
    // "snap-on": its parts (the last may be unfinished), or the joined form the index also holds
    const slots = group.parts.map((part, i) => wordSlot(index, part, group.last && i === group.parts!.length - 1, budget));
    if (slots.every((slot) => slot.size > 0)) alternatives.push(slots);
    single(group.text.replace(/[^a-z0-9]+/g, ''), BOOST.exact);
  } else {
    const slot = wordSlot(index, group.text, group.last, budget);
    if (slot.size) alternatives.push([slot]);
  }
  return alternatives;
}

/** Per index term: the documents (by position) that hold it, and its weight in each. */
export interface Postings {
  docs: Int32Array;
  weights: Float32Array;
}

/**
 * The plain-word scorer's view of the lunr index, derived once when an index is put in place.
 * lunr scores a document as Σ over fields of (query vector · field vector) / |query vector|, the
 * field vectors holding lunr's BM25 weights with the field boosts (lunr.Index.prototype.query,
 * lunr.Vector.prototype.similarity). For plain words every term counts in every field, so a
 * term's share of a document's score is one number, Σ_fields w(term, field, doc), and the query
 * vector's length is √(Σ boost²). Kept as typed arrays per term, a query adds
 * them up in a Float64Array: the same scores as lunr.Index.query (to float32 rounding) without
 * the objects lunr makes for every matching field of every document (the profile of a broad
 * word such as "print" spent most of its time there and in the garbage collector).
 */
export function compactPostings(index: lunr.Index, positionOf: Map<string, number>): Map<string, Postings> {
  const internals = index as unknown as IndexInternals & { fieldVectors: Record<string, { elements: number[]; magnitude(): number }> };
  const termOf: string[] = [];
  for (const term of Object.keys(internals.invertedIndex)) termOf[(internals.invertedIndex[term] as { _index: number })._index] = term;
  const lists = new Map<number, { docs: number[]; weights: number[] }>();
  for (const [fieldRef, vector] of Object.entries(internals.fieldVectors)) {
    const doc = positionOf.get(fieldRef.slice(fieldRef.indexOf('/') + 1));
    if (doc === undefined) continue;
    const el = vector.elements;
    for (let i = 0; i < el.length; i += 2) {
      let list = lists.get(el[i]);
      if (!list) lists.set(el[i], (list = { docs: [], weights: [] }));
      const n = list.docs.length;
      // fields of one document come one after another: add to its entry instead of a new one
      if (n && list.docs[n - 1] === doc) list.weights[n - 1] += el[i + 1];
      else {
        list.docs.push(doc);
        list.weights.push(el[i + 1]);
      }
    }
  }
  const postings = new Map<string, Postings>();
  for (const [termIndex, list] of lists) {
    const term = termOf[termIndex];
    if (term !== undefined) postings.set(term, { docs: Int32Array.from(list.docs), weights: Float32Array.from(list.weights) });
  }
  return postings;
}

/**
 * Plain words: each group (a word, a hyphenated word, a mount name, a trade synonym, a camera body)
 * matches on its own. Every part that has any of the terms is scored; which groups each part
 * matched comes from bit masks of the slots its terms meet. Parts that match all groups rank
 * first, then those that match most of them (coordination), so a search where only some words
 * match never comes back empty.
 */
export function plainMatches(
  index: lunr.Index,
  groups: TermGroup[],
  documents: readonly SearchDocument[],
  postings: Map<string, Postings>,
  budget: Budget,
): Match[] {
  const expanded = groups.map((g) => expandGroup(index, g, budget));
  // one bit per slot (at most 64: two 32-bit words); a group is met when all slots of one of its alternatives are
  const terms = new Map<string, { boost: number; lo: number; hi: number }>();
  const groupMasks: { lo: number; hi: number }[][] = [];
  let bit = 0;
  for (const alternatives of expanded) {
    const masks: { lo: number; hi: number }[] = [];
    for (const alt of alternatives) {
      if (bit + alt.length > 64) break;
      const mask = { lo: 0, hi: 0 };
      for (const slot of alt) {
        const lo = bit < 32 ? 1 << bit : 0;
        const hi = bit >= 32 ? 1 << (bit - 32) : 0;
        bit += 1;
        mask.lo |= lo;
        mask.hi |= hi;
        for (const [term, boost] of slot) {
          const t = terms.get(term) ?? { boost: 0, lo: 0, hi: 0 };
          t.boost = Math.max(t.boost, boost);
          t.lo |= lo;
          t.hi |= hi;
          terms.set(term, t);
        }
      }
      masks.push(mask);
    }
    groupMasks.push(masks);
  }
  if (terms.size === 0) return [];
  budget.check();
  const n = documents.length;
  const score = new Float64Array(n);
  const lo = new Int32Array(n);
  const hi = new Int32Array(n);
  const touched: number[] = [];
  for (const [term, t] of terms) {
    const p = postings.get(term);
    if (!p) continue;
    const { docs, weights } = p;
    for (let i = 0; i < docs.length; i++) {
      const d = docs[i];
      if (lo[d] === 0 && hi[d] === 0) touched.push(d);
      score[d] += t.boost * weights[i];
      lo[d] |= t.lo;
      hi[d] |= t.hi;
    }
  }
  let squares = 0;
  for (const t of terms.values()) squares += t.boost * t.boost;
  const norm = Math.sqrt(squares) || 1;
  const matches: Match[] = [];
  for (const d of touched) {
    const matched: number[] = [];
    for (let g = 0; g < groupMasks.length; g++) {
      if (groupMasks[g].some((m) => (lo[d] & m.lo) === m.lo && (hi[d] & m.hi) === m.hi)) matched.push(g);
    }
    if (matched.length) matches.push({ doc: documents[d], score: score[d] / norm, groups: matched });
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
export function syntaxMatches(index: lunr.Index, text: string, original: string, byRef: Map<string, SearchDocument>, budget: Budget): Match[] {
  const internals = index as unknown as IndexInternals;
  const clauses = readSyntax(text, original);
  const expanded: Clause[] = [];
  const anyOf: string[][] = [];
  for (const clause of clauses) {
    budget.check();
    const words = clause.usePipeline
      ? (internals.pipeline as unknown as { runString(s: string, meta: object): string[] }).runString(clause.term, { fields: clause.fields })
      : [clause.term];
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
