// Reading what a crew member typed into the shelf search: the search text (plain words, mount names,
// or query syntax); the envelope and key dimensions are read by fields.ts, re-exported here.
import lunr from 'lunr';
import type { MountSlug } from '../catalogue';
import { MOUNT_STANDARDS } from '../catalogue';
import { BASE_PHRASES, mountToken, normaliseQueryText, PhraseTable } from './aliases';

export {
  MAX_DIMENSION_MM,
  MAX_ENVELOPE_MM,
  MAX_TOLERANCE_MM,
  parseDimension,
  parseEnvelope,
  splitList,
  type DimensionQuery,
  type Envelope,
  type Parsed,
} from './fields';

// ---------------------------------------------------------------------------------------------
// The search text

export interface TermGroup {
  /** word: one typed word; mount: a phrase naming a mount standard; phrase: a synonym or camera body. */
  kind: 'word' | 'mount' | 'phrase';
  /** What the crew member typed for it (normalised): shown back as matched or missing. */
  text: string;
  /** mount / phrase: the index tokens it stands for (any of them matches). */
  tokens?: string[];
  mount?: MountSlug;
  /** A phrase of one word ("dovetail", "receiver"): the word itself may match too. */
  alsoWord?: boolean;
  /** A hyphenated word ("snap-on"): its parts as the index holds them; the joined form matches too. */
  parts?: string[];
  /** The last thing typed (a word): it may be unfinished, so it also matches as a prefix. */
  last: boolean;
}

export type TextQuery =
  | { kind: 'none' }
  | { kind: 'plain'; groups: TermGroup[] }
  /** Query syntax (field:, +, -, ~, ^, *), mount names already replaced by their tokens. */
  | { kind: 'syntax'; text: string };

/** At most this many words count; the rest of a pasted paragraph is ignored. */
export const MAX_TERMS = 12;

/**
 * What one search may cost. A typo automaton grows with the word's length to the power of the
 * edit distance (lunr builds it whole before looking at the index): 12 letters at distance 7 took
 * half a minute and gigabytes, so distances are capped and long words get fewer edits.
 */
export const SEARCH_LIMITS = {
  /** `word~7` is read as `word~2`. */
  maxEditDistance: 2,
  /** The longest word given 2 edits (about 10 ms of automaton); 1 edit up to `oneEditUpTo`. */
  twoEditsUpTo: 14,
  oneEditUpTo: 30,
  /** `*` in one query, and the letters that must come before the first `*` of a word. */
  maxWildcards: 2,
  minWildcardPrefix: 2,
  /** Index terms one word may stand for (prefix, typo or wildcard expansions), shortest first. */
  maxExpansions: 50,
  /** A search still running after this long stops with an error instead of holding the shelf up. */
  budgetMs: 1000,
} as const;

/** The edit distance a word of this length may get: the asked one, capped by length. */
export function allowedEditDistance(asked: number, wordLength: number): number {
  const capped = Math.min(Math.max(0, Math.floor(asked)), SEARCH_LIMITS.maxEditDistance);
  if (capped >= 2 && wordLength > SEARCH_LIMITS.twoEditsUpTo) return wordLength > SEARCH_LIMITS.oneEditUpTo ? 0 : 1;
  if (capped >= 1 && wordLength > SEARCH_LIMITS.oneEditUpTo) return 0;
  return capped;
}

// field:term, +term, -term, term~1, term^2, te*m. A hyphen inside a word (KX-8, v-mount) is not syntax.
const SYNTAX = /(?:^|[\s+-])[a-z][a-z0-9]*:|(?:^|\s)[+-]|[~^*]/i;

export function hasQuerySyntax(text: string): boolean {
  return SYNTAX.test(text);
}

/** The words of a text as the index sees them before stemming: lunr's tokenizer, trimmer and stop words. */
export function queryWords(text: string): string[] {
  return lunr
    .tokenizer(text)
    .map((token) => lunr.stopWordFilter(lunr.trimmer(token)))
    .filter((token): token is lunr.Token => !!token && token.toString().length > 0)
    .map((token) => token.toString());
}

const DEFAULT_PHRASES = new PhraseTable(BASE_PHRASES);
const MOUNT_OF_TOKEN = new Map(MOUNT_STANDARDS.map((m) => [mountToken(m.slug), m.slug as MountSlug]));

/**
 * Reads the search text into groups, one per thing the crew member asked for: a phrase from the
 * table (mount names, trade synonyms and, when the index passes them, camera-body names) or a
 * word. Each group matches on its own; the searcher ranks parts by how many groups they match.
 */
export function readQueryText(q: string | undefined, phrases: PhraseTable = DEFAULT_PHRASES): TextQuery {
  // a dash standing alone between words is punctuation, not "leave out the next word"
  const text = normaliseQueryText(q ?? '')
    .replace(/(^|\s)-+(?=\s|$)/g, ' ')
    .trim();
  if (!text) return { kind: 'none' };
  if (hasQuerySyntax(text)) return { kind: 'syntax', text: phrases.find(text).replaced };

  const { mentions, rest } = phrases.find(text);
  const groups: TermGroup[] = [];
  const seen = new Set<string>();
  for (const m of mentions) {
    const key = `phrase:${m.tokens.join(' ')}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const mount = m.tokens.map((t) => MOUNT_OF_TOKEN.get(t)).find(Boolean);
    groups.push({ kind: mount ? 'mount' : 'phrase', text: m.phrase, tokens: m.tokens, ...(mount ? { mount } : {}), alsoWord: m.singleWord, last: false });
  }
  // the prefix rule applies only while the text ends in a plain word, not in a phrase
  const endsInPhrase = mentions.length > 0 && text.endsWith(mentions[mentions.length - 1].phrase);
  const chunks = rest.split(' ').filter(Boolean);
  chunks.forEach((chunk, i) => {
    const words = queryWords(chunk);
    if (!words.length) return;
    const last = !endsInPhrase && i === chunks.length - 1;
    const joined = chunk.includes('-') ? chunk.replace(/[^a-z0-9]+/g, '') : '';
    if (words.length > 1 || (joined && joined !== words[0])) {
      const shown = chunk.replace(/^[^a-z0-9]+|[^a-z0-9]+$/g, '');
      if (seen.has(`word:${shown}`)) return;
      seen.add(`word:${shown}`);
      groups.push({ kind: 'word', text: shown, parts: words, last });
      return;
    }
    const word = words[0];
    if (seen.has(`word:${word}`)) return;
    seen.add(`word:${word}`);
    groups.push({ kind: 'word', text: word, last });
  });
  if (!groups.length) return { kind: 'none' };
  // in the order typed, so matched / missing read like the search text
  const at = (g: TermGroup) => text.indexOf(g.text);
  groups.sort((a, b) => at(a) - at(b));
  return { kind: 'plain', groups: groups.slice(0, MAX_TERMS) };
}
