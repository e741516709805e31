// Camera bodies by name: the maker and model, the model alone, or any alias the admin set, however
// it is spaced, hyphenated or capitalised ("KX8", "kx-8", "Korvel KX 8"). Pure: the searcher reads
// bodies named in the query text with it, and the body filter resolves its values with it.
import { distance } from 'fastest-levenshtein';
import type { PhraseEntry } from './aliases';

export interface NamedBody {
  slug: string;
  maker: string;
  model: string;
  aliases: readonly string[];
}

/** The token standing for a camera body in the index ("_" at both ends: see mountToken). */
export function bodyToken(slug: string): string {
  return `_body_${slug.toLowerCase().replace(/[^a-z0-9]+/g, '_')}_`;
}

/** Letters and digits only, lower case: how names are compared. */
export const compactName = (text: string) =>
  text
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]+/gu, '');

/** Every name a body answers to. */
export function bodyNames(b: NamedBody): string[] {
  return [...new Set([`${b.maker} ${b.model}`, b.model, ...b.aliases, ...b.aliases.map((a) => `${b.maker} ${a}`)])];
}

export function bodyPhraseEntries(bodies: readonly NamedBody[]): PhraseEntry[] {
  return bodies.flatMap((b) => bodyNames(b).map((text) => ({ text, token: bodyToken(b.slug) })));
}

export type BodyResolution = { ok: true; slug: string } | { ok: false; closest: string[] };

/**
 * A body filter value: a slug, or a name the body answers to, compared as compact names. When
 * none fits, the closest known bodies by edit distance between compact names (at most three).
 */
export function resolveBody(value: string, bodies: readonly NamedBody[]): BodyResolution {
  const wanted = compactName(value);
  const bySlug = bodies.find((b) => b.slug === value.trim().toLowerCase());
  if (bySlug) return { ok: true, slug: bySlug.slug };
  const byName = bodies.find((b) => bodyNames(b).some((n) => compactName(n) === wanted));
  if (byName) return { ok: true, slug: byName.slug };
  const ranked = bodies
    .map((b) => ({ b, d: Math.min(...bodyNames(b).map((n) => distance(compactName(n), wanted))) }))
    .sort((x, y) => x.d - y.d || x.b.slug.localeCompare(y.b.slug));
  return { ok: false, closest: ranked.slice(0, 3).map(({ b }) => `${b.maker} ${b.model}`) };
}
