import { z } from 'zod';
import { CATEGORY_SLUGS, type CategorySlug, type MountSlug } from '../catalogue';
import { MATERIAL_IDS, type MaterialId } from '../materials';
import { resolveMount } from '../search/aliases';
import { parseDimension, parseEnvelope, splitList, type DimensionQuery, type Envelope } from '../search/fields';
import { boolish } from '../validation';

import { SEARCH_SORTS } from '../search/fields';
export { SEARCH_SORTS, type SearchSort } from '../search/fields';

export const SEARCH_PARAMS = ['q', 'body', 'mount', 'category', 'material', 'fit', 'dim', 'adaptable', 'minRating', 'sort', 'page', 'pageSize'] as const;

const stringOrList = z.union([z.string(), z.array(z.string())], { error: 'Send the value as text.' });
const single = (message: string) => z.string({ error: message });

/** A list parameter whose every value goes through `read` (null = not accepted, with a message). */
function listOf<T>(read: (value: string) => T | null, refusal: (value: string) => string) {
  return stringOrList.optional().transform((raw, ctx) => {
    const out: T[] = [];
    for (const value of splitList(raw)) {
      const item = read(value);
      if (item === null) ctx.addIssue({ code: 'custom', message: refusal(value) });
      else if (!out.includes(item)) out.push(item);
    }
    return out;
  });
}

const materialFor = (value: string) => MATERIAL_IDS.find((m) => m.toLowerCase() === value.toLowerCase()) ?? null;

export const searchQuerySchema = z.strictObject(
  {
    q: single('Send the search text once, as q=…')
      .trim()
      .max(200, 'Keep the search text under 200 characters.')
      .optional()
      .transform((v) => v || undefined),
    // a slug or any name the body answers to ("KX8", "Korvel KX-8"); the searcher resolves it
    // against the known bodies and names the closest ones when none fits
    body: listOf<string>(
      (v) => (v.length <= 80 ? v : null),
      (v) => `"${v.slice(0, 40)}…" is too long for a camera-body name. Use the maker and model, e.g. Korvel KX-8.`,
    ),
    mount: listOf<MountSlug>(resolveMount, (v) => `Unknown mount standard "${v}". Use a slug from the list (e.g. screw-1-4-20) or a name such as 1/4" or LWS.`),
    category: listOf<CategorySlug>(
      (v) => CATEGORY_SLUGS.find((c) => c === v.toLowerCase()) ?? null,
      (v) => `Unknown category "${v}". Choose one of: ${CATEGORY_SLUGS.join(', ')}.`,
    ),
    material: listOf<MaterialId>(materialFor, (v) => `Unknown material "${v}". Choose one of: ${MATERIAL_IDS.join(', ')}.`),
    fit: single('Send one space to fit in, like fit=120x80x40.')
      .optional()
      .transform((raw, ctx): Envelope | undefined => {
        if (raw === undefined || raw.trim() === '') return undefined;
        const parsed = parseEnvelope(raw);
        if (parsed.ok) return parsed.value;
        ctx.addIssue({ code: 'custom', message: parsed.message });
        return z.NEVER;
      }),
    dim: stringOrList.optional().transform((raw, ctx): DimensionQuery[] => {
      const texts = raw === undefined ? [] : (Array.isArray(raw) ? raw : [raw]).filter((t) => t.trim() !== '');
      if (texts.length > 5) ctx.addIssue({ code: 'custom', message: 'Ask for at most 5 key dimensions at once.' });
      const out: DimensionQuery[] = [];
      for (const text of texts) {
        const parsed = parseDimension(text);
        if (parsed.ok) out.push(parsed.value);
        else ctx.addIssue({ code: 'custom', message: parsed.message });
      }
      return out;
    }),
    adaptable: boolish.optional(),
    minRating: z.coerce
      .number({ error: 'Give the lowest rating as a number from 0 to 5.' })
      .min(0, 'Give the lowest rating as a number from 0 to 5.')
      .max(5, 'Give the lowest rating as a number from 0 to 5.')
      .optional(),
    sort: z.enum(SEARCH_SORTS, { error: 'Sort by relevance, newest or proven.' }).default('relevance'),
    page: z.coerce
      .number({ error: 'Give the page as a whole number from 1.' })
      .int('Give the page as a whole number from 1.')
      .min(1, 'Give the page as a whole number from 1.')
      .max(500, 'Pages stop at 500; narrow the search instead.')
      .default(1),
    pageSize: z.coerce
      .number({ error: 'Give the page size as a whole number from 1 to 100.' })
      .int('Give the page size as a whole number from 1 to 100.')
      .min(1, 'Give the page size as a whole number from 1 to 100.')
      .max(100, 'Give the page size as a whole number from 1 to 100.')
      .default(20),
  },
  {
    error: (issue) =>
      issue.code === 'unrecognized_keys'
        ? `Unknown search parameter ${issue.keys.map((k) => `"${k}"`).join(', ')}. Use ${SEARCH_PARAMS.join(', ')}.`
        : undefined,
  },
);

export type SearchQueryInput = z.input<typeof searchQuerySchema>;
export type SearchQuery = z.output<typeof searchQuerySchema>;
