// The words crews type for a mount standard ("1/4\"", "quarter inch", "LWS", "v-mount"…) become one
// synthetic search token per standard. The same token is indexed for every part that declares the
// mount and read out of the query text, so any of the names finds the part.
import { MOUNT_STANDARDS, type MountSlug } from '../catalogue';
import { synonymToken, TRADE_SYNONYMS } from './synonyms';

/**
 * The token that stands for a mount standard in the index. It starts and ends with "_" so no real
 * word shares its prefix (the last query word gets a trailing wildcard), and the search pipeline's
 * trimmer and stemmer leave it untouched (tests/unit/search-aliases.test.ts checks that).
 */
export function mountToken(slug: string): string {
  return `_mount_${slug.toLowerCase().replace(/[^a-z0-9]+/g, '_')}_`;
}

/**
 * A number with its unit, as crews type it ("15mm", "15 mm", "15-mm", "1/4in", "1/4 inch", "3/8\""),
 * written one way: number and unit fused, unit as mm, cm or in. Applied to the query and to the
 * indexed text alike, so "15mm" and "15 mm" are the same word.
 */
const NUMBER_WITH_UNIT = /(?<![\w./-])(\d+(?:\.\d+)?(?:\/\d+)?)[ -]?(?:(mm|millimet(?:er|re)s?|cm|centimet(?:er|re)s?|inch(?:es)?|in)(?![a-z0-9])|("))/g;
const UNIT: Record<string, string> = { mm: 'mm', cm: 'cm', in: 'in', inch: 'in', '"': 'in' };

export function fuseUnits(text: string): string {
  return text.replace(NUMBER_WITH_UNIT, (_all, n: string, word: string | undefined, mark: string | undefined) => {
    const unit = word ? (UNIT[word] ?? (word.startsWith('mil') ? 'mm' : word.startsWith('cent') ? 'cm' : 'in')) : UNIT[mark!];
    return `${n}${unit} `;
  });
}

/** Same-looking characters people type for inch marks and dashes folded, case, spacing and units. */
export function normaliseQueryText(text: string): string {
  // plain ASCII (nearly every part text) has no look-alike marks or dashes to fold
  const folded = /^[\x00-\x7f]*$/.test(text)
    ? text.toLowerCase()
    : text
        .replace(/[″”“„‟]|′′/g, '"') // before NFKC, which would turn ″ into two primes
        .normalize('NFKC')
        .toLowerCase()
        .replace(/[‐‑‒–—]/g, '-');
  return fuseUnits(folded).replace(/\s+/g, ' ').trim();
}

// ---------------------------------------------------------------------------------------------
// Phrases: names that stand for one search token (mount standards, trade synonyms, camera bodies)

export interface PhraseEntry {
  text: string;
  token: string;
}

export interface PhraseMention {
  /** The phrase as found in the (normalised) text. */
  phrase: string;
  /** The tokens it stands for (a phrase can name a mount and a synonym set at once). */
  tokens: string[];
  /** One word of letters and digits (e.g. "dovetail", "receiver"): the word itself may match too. */
  singleWord: boolean;
}

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&');

/**
 * A phrase as a pattern that forgives how it is typed: a hyphen, a space or nothing between its
 * words and between letters and digits ("v-style", "v style", "vstyle"; "KX-8", "kx 8"), and an
 * English plural on each word ("plates", "batteries"). Whole words only: "lws" matches in
 * "lws plate" but not in "glwsx"; one that ends in an inch mark may run into the next word.
 */
function flexiblePattern(text: string): string {
  const words = text.split(/[\s-]+/).filter(Boolean);
  const body = words
    .map((word, wi) => {
      const letters = /^[a-z]+$/.test(word);
      const plural = /[a-z]$/.test(word) && !/\d/.test(word) ? (word.endsWith('y') ? '' : '(?:e?s)?') : '';
      // a name given in the plural ("15mm rods") also matches the singular
      const stem =
        letters && word.endsWith('y')
          ? `${escape(word.slice(0, -1))}(?:y|ies)`
          : letters && word.length >= 4 && /[^s]s$/.test(word)
            ? `${escape(word.slice(0, -1))}`
            : null;
      // letters and digits side by side may be typed apart: kx8, kx 8, kx-8
      const inner =
        stem ??
        word
          .split(/(?<=[a-z])(?=\d)|(?<=\d)(?=[a-z])/)
          .map(escape)
          .join('[\\s-]?');
      return `${inner}${plural}${wi < words.length - 1 ? '[\\s-]?' : ''}`;
    })
    .join('');
  // "_" counts as a word character so nothing is found inside a token such as _mount_battery_v_style_
  return `${/^[a-z0-9]/.test(text) ? '(?<![a-z0-9_])' : ''}(?:${body})${/[a-z0-9]$/.test(text) ? '(?![a-z0-9_])' : ''}`;
}

export class PhraseTable {
  private readonly pattern: RegExp | null;
  /** One per alternative of the pattern, in the same order as its capture groups. */
  private readonly entries: { tokens: string[]; singleWord: boolean }[] = [];

  constructor(entries: readonly PhraseEntry[]) {
    // spellings that differ only in hyphens and spaces are one phrase standing for all their tokens
    const byKey = new Map<string, { text: string; tokens: string[] }>();
    for (const e of entries) {
      const text = normaliseQueryText(e.text);
      if (!text) continue;
      const key = text.replace(/[\s-]+/g, '');
      const known = byKey.get(key);
      if (!known) byKey.set(key, { text, tokens: [e.token] });
      else if (!known.tokens.includes(e.token)) known.tokens.push(e.token);
    }
    // longest first, so "15mm studio" wins over "15mm" and "3/8-16" over "3/8in"
    const ordered = [...byKey.values()].sort((a, b) => b.text.length - a.text.length || a.text.localeCompare(b.text));
    for (const p of ordered) this.entries.push({ tokens: p.tokens, singleWord: /^[a-z0-9]+$/.test(p.text) });
    this.pattern = ordered.length ? new RegExp(ordered.map((p) => `(${flexiblePattern(p.text)})`).join('|'), 'g') : null;
  }

  /** Phrases named in normalised text, in order, longest first, each stretch of text used once. */
  find(normalised: string): { mentions: PhraseMention[]; rest: string; replaced: string } {
    const mentions: PhraseMention[] = [];
    if (!this.pattern) return { mentions, rest: normalised, replaced: normalised };
    let rest = '';
    let replaced = '';
    let at = 0;
    for (const m of normalised.matchAll(this.pattern)) {
      const found = m[0];
      const offset = m.index;
      const entry = this.entries[m.findIndex((g, i) => i > 0 && g !== undefined) - 1];
      mentions.push({ phrase: found, tokens: entry.tokens, singleWord: entry.singleWord });
      rest += `${normalised.slice(at, offset)} `;
      // no spaces added around a token unless a word follows directly (1/4"plate): query syntax
      // such as mounts:lws or +lws keeps its meaning
      replaced += normalised.slice(at, offset) + (/\w/.test(normalised.charAt(offset + found.length)) ? `${entry.tokens[0]} ` : entry.tokens[0]);
      at = offset + found.length;
    }
    rest += normalised.slice(at);
    replaced += normalised.slice(at);
    return { mentions, rest: rest.replace(/\s+/g, ' ').trim(), replaced: replaced.trim() };
  }
}

// "Other (see note)" names no standard; matching its label would turn the word "other" into a mount.
const MOUNT_ENTRIES: PhraseEntry[] = MOUNT_STANDARDS.filter((m) => m.slug !== 'other').flatMap((m) =>
  [m.label, ...m.aliases].map((text) => ({ text, token: mountToken(m.slug) })),
);
const SYNONYM_ENTRIES: PhraseEntry[] = TRADE_SYNONYMS.flatMap((set) => set.phrases.map((text) => ({ text, token: synonymToken(set.key) })));

const MOUNTS = new PhraseTable(MOUNT_ENTRIES);
/** Mount names and trade synonyms: what the query text is read with (bodies are added per index). */
export const BASE_PHRASES: readonly PhraseEntry[] = [...MOUNT_ENTRIES, ...SYNONYM_ENTRIES];
const SLUG_OF_TOKEN = new Map(MOUNT_STANDARDS.map((m) => [mountToken(m.slug), m.slug as MountSlug]));

export interface MountMention {
  slug: MountSlug;
  /** The phrase as found in the (normalised) text. */
  phrase: string;
  singleWord: boolean;
}

export interface AliasExpansion {
  /** Mount standards named in the text, in order of appearance. */
  mentions: MountMention[];
  /** The normalised text with each phrase cut out (a space left in its place). */
  rest: string;
  /** The normalised text with each phrase replaced by its mount token. */
  replaced: string;
}

/** Finds mount-standard names in typed text, longest name first, each stretch of text used once. */
export function expandMountAliases(text: string): AliasExpansion {
  const found = MOUNTS.find(normaliseQueryText(text));
  return {
    mentions: found.mentions.map((m) => ({ slug: SLUG_OF_TOKEN.get(m.tokens[0])!, phrase: m.phrase, singleWord: m.singleWord })),
    rest: found.rest,
    replaced: found.replaced,
  };
}

/** Hyphenated words also written joined ("v-style" → "vstyle"), so either spelling finds them. */
function joinedCompounds(text: string): string[] {
  return [...text.matchAll(/(?<![a-z0-9-])[a-z0-9]+(?:-[a-z0-9]+)+(?![a-z0-9-])/g)].map((m) => m[0].replace(/-/g, ''));
}

const SINGULARS = new Map<string, string>();

/** One spelling per word for phrase look-ups: plural endings dropped ("batteries" → "battery"). */
function singular(word: string): string {
  let known = SINGULARS.get(word);
  if (known === undefined) {
    known = singularOf(word);
    // the shelf's vocabulary is small; a pasted wall of unique words must not grow this forever
    if (SINGULARS.size < 100_000) SINGULARS.set(word, known);
  }
  return known;
}

function singularOf(word: string): string {
  if (!/^[a-z]{4,}$/.test(word) || /(ss|us|is)$/.test(word)) return word;
  if (word.endsWith('ies')) return `${word.slice(0, -3)}y`;
  if (/(ches|shes|xes|sses)$/.test(word)) return word.slice(0, -2);
  return word.endsWith('s') ? word.slice(0, -1) : word;
}

const phraseKey = (words: readonly string[]) => words.map(singular).join('');

/** Synonym phrases by their key (words singular, joined without separators), for indexed text. */
const SYNONYM_KEYS = new Map<string, string[]>();
/** Keys of the first words of longer phrases: a run that is none of these stops growing. */
const SYNONYM_PREFIXES = new Set<string>();
let LONGEST_SYNONYM = 1;
for (const set of TRADE_SYNONYMS) {
  for (const phrase of set.phrases) {
    const words = normaliseQueryText(phrase)
      .split(/[^a-z0-9]+/)
      .filter(Boolean);
    LONGEST_SYNONYM = Math.max(LONGEST_SYNONYM, words.length);
    const key = phraseKey(words);
    for (let n = 1; n < words.length; n++) SYNONYM_PREFIXES.add(phraseKey(words.slice(0, n)));
    const tokens = SYNONYM_KEYS.get(key) ?? [];
    if (!tokens.includes(synonymToken(set.key))) tokens.push(synonymToken(set.key));
    SYNONYM_KEYS.set(key, tokens);
  }
}

/**
 * The synonym tokens of every phrase in a text, overlapping ones included ("cheese riser" and
 * "riser"). A look-up of each run of up to LONGEST_SYNONYM words, so hyphens, spaces, joined
 * spellings and plurals are folded the way the query's phrase table folds them; linear in the
 * text, which matters when 50,000 parts are indexed.
 */
export function synonymTokensIn(normalised: string): string[] {
  const words = normalised
    .split(/[^a-z0-9]+/)
    .filter(Boolean)
    .map(singular);
  const found = new Set<string>();
  for (let i = 0; i < words.length; i++) {
    let key = '';
    for (let n = 0; n < LONGEST_SYNONYM && i + n < words.length; n++) {
      key += words[i + n];
      const tokens = SYNONYM_KEYS.get(key);
      if (tokens) for (const t of tokens) found.add(t);
      if (!SYNONYM_PREFIXES.has(key)) break;
    }
  }
  return [...found];
}

/**
 * Text as the index holds it: normalised like a query (units fused), with the joined form of each
 * hyphenated word and the token of each trade-synonym phrase it contains added at the end.
 */
export function indexText(text: string): string {
  if (!text) return '';
  const normalised = normaliseQueryText(text);
  const extra = [...new Set([...joinedCompounds(normalised), ...synonymTokensIn(normalised)])];
  return extra.length ? `${normalised} ${extra.join(' ')}` : normalised;
}

/** A mount filter value: a slug, or a label or alias typed in full ("1/4\"", "LWS"). */
export function resolveMount(value: string): MountSlug | null {
  const v = value.trim();
  const bySlug = MOUNT_STANDARDS.find((m) => m.slug === v.toLowerCase());
  if (bySlug) return bySlug.slug;
  const normalised = normaliseQueryText(v);
  const found = MOUNTS.find(normalised);
  // the whole value must be one name, not a name inside other words
  if (found.mentions.length !== 1 || found.rest !== '') return null;
  return SLUG_OF_TOKEN.get(found.mentions[0].tokens[0]) ?? null;
}

/** What the index holds for a part's mounts: the synthetic tokens, the labels and any notes. */
export function mountIndexText(mounts: readonly { slug: string; note?: string | null }[]): string {
  return mounts
    .map((m) => {
      // "Other (see note)" says nothing about the part; its note does
      const label = m.slug === 'other' ? '' : (MOUNT_STANDARDS.find((s) => s.slug === m.slug)?.label ?? m.slug);
      return [mountToken(m.slug), label, m.note ?? ''].filter(Boolean).join(' ');
    })
    .join(' ')
    .trim();
}
