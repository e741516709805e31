// The words crews type for a mount standard ("1/4\"", "quarter inch", "LWS", "v-mount"…) become one
// synthetic search token per standard. The same token is indexed for every part that declares the
// mount and read out of the query text, so any of the names finds the part.
import { MOUNT_STANDARDS, type MountSlug } from '../catalogue';

/**
 * The token that stands for a mount standard in the index. It starts and ends with "_" so no real
 * word shares its prefix (the last query word gets a trailing wildcard), and the search pipeline's
 * trimmer and stemmer leave it untouched (tests/unit/search-aliases.test.ts checks that).
 */
export function mountToken(slug: string): string {
  return `_mount_${slug.toLowerCase().replace(/[^a-z0-9]+/g, '_')}_`;
}

/** Same-looking characters people type for inch marks and dashes, folded before matching. */
export function normaliseQueryText(text: string): string {
  return text
    .replace(/[″”“„‟]|′′/g, '"') // before NFKC, which would turn ″ into two primes
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[‐‑‒–—]/g, '-')
    .replace(/\s+/g, ' ')
    .trim();
}

interface Phrase {
  text: string;
  slug: MountSlug;
  /** One word of letters and digits (e.g. "dovetail", "lws"): it also counts as a plain word. */
  singleWord: boolean;
}

// "Other (see note)" names no standard; matching its label would turn the word "other" into a mount.
const PHRASES: Phrase[] = MOUNT_STANDARDS.filter((m) => m.slug !== 'other')
  .flatMap((m) => [m.label, ...m.aliases].map((text) => ({ text: normaliseQueryText(text), slug: m.slug as MountSlug })))
  .filter((p, i, all) => p.text.length > 0 && all.findIndex((q) => q.text === p.text) === i)
  .map((p) => ({ ...p, singleWord: /^[a-z0-9]+$/.test(p.text) }))
  // longest first, so "15mm studio" wins over "15 mm" and "3/8-16" over "3/8\""
  .sort((a, b) => b.text.length - a.text.length || a.text.localeCompare(b.text));

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&');
// A phrase counts only as whole words: "lws" matches in "lws plate" but not in "glwsx"; one that
// ends in an inch mark may run straight into the next word (1/4"plate).
const wholeWords = (text: string) => `${/^[a-z0-9]/.test(text) ? '(?<![a-z0-9])' : ''}${escape(text)}${/[a-z0-9]$/.test(text) ? '(?![a-z0-9])' : ''}`;
const PHRASE_PATTERN = new RegExp(PHRASES.map((p) => wholeWords(p.text)).join('|'), 'g');
const BY_TEXT = new Map(PHRASES.map((p) => [p.text, p]));

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
  const normalised = normaliseQueryText(text);
  const mentions: MountMention[] = [];
  const rest = normalised.replace(PHRASE_PATTERN, (found) => {
    const phrase = BY_TEXT.get(found)!;
    mentions.push({ slug: phrase.slug, phrase: found, singleWord: phrase.singleWord });
    return ' ';
  });
  // no spaces added around a token unless a word follows directly (1/4"plate): query syntax such as
  // mounts:lws or +lws keeps its meaning
  const replaced = normalised.replace(PHRASE_PATTERN, (found: string, offset: number, whole: string) => {
    const token = mountToken(BY_TEXT.get(found)!.slug);
    return /\w/.test(whole.charAt(offset + found.length)) ? `${token} ` : token;
  });
  return { mentions, rest: rest.replace(/\s+/g, ' ').trim(), replaced: replaced.trim() };
}

/** A mount filter value: a slug, or a label or alias typed in full ("1/4\"", "LWS"). */
export function resolveMount(value: string): MountSlug | null {
  const v = value.trim();
  const bySlug = MOUNT_STANDARDS.find((m) => m.slug === v.toLowerCase());
  if (bySlug) return bySlug.slug;
  return BY_TEXT.get(normaliseQueryText(v))?.slug ?? null;
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
