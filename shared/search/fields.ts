// Reading the fields of the shelf search that are not text: the envelope a part must fit in and key
// dimensions with a tolerance. Kept apart from query.ts (which reads text with lunr's tokenizer) so
// the client's search form parses them without loading a search engine.
import { parseLength } from '../units';

export const SEARCH_SORTS = ['relevance', 'newest', 'proven'] as const;
export type SearchSort = (typeof SEARCH_SORTS)[number];

export type Envelope = [number, number, number];

export interface DimensionQuery {
  /** Matched case-insensitively against the part's key dimension names (contains). */
  name: string;
  valueMm: number;
  tolMm: number;
}

export type Parsed<T> = { ok: true; value: T } | { ok: false; message: string };

/** The largest envelope side we take seriously; anything bigger is a unit slip. */
export const MAX_ENVELOPE_MM = 5000;
export const MAX_DIMENSION_MM = 2000;
export const MAX_TOLERANCE_MM = 50;

const FIT_EXAMPLE = 'like 120x80x40 (millimetres) or 4.5in x 3in x 1in';

/**
 * Reads "120x80x40", "4.5in x 3in x 1in", "4.5\"x3\"x1\"" or "120 × 80 × 40 mm"-style envelopes.
 * Each side may carry its own unit (mm, cm, in, "); a bare number is millimetres. Separators: × x *.
 */
export function parseEnvelope(text: string): Parsed<Envelope> {
  const sides = text.trim().split(/\s*[×xX*]\s*/);
  if (sides.length !== 3 || sides.some((s) => s === '')) {
    return { ok: false, message: `Give the space as three lengths separated by x, ${FIT_EXAMPLE}.` };
  }
  const mm: number[] = [];
  for (const side of sides) {
    const value = parseLength(side);
    if (value === null) return { ok: false, message: `"${side}" is not a length. Write each side ${FIT_EXAMPLE}.` };
    if (value <= 0) return { ok: false, message: 'Each side of the space must be more than 0 mm.' };
    if (value > MAX_ENVELOPE_MM) return { ok: false, message: `"${side}" is more than 5 m; check the unit.` };
    mm.push(value);
  }
  return { ok: true, value: mm as Envelope };
}

const DIM_EXAMPLE = 'e.g. "rod bore:15:0.3" or "plate width:4in:0.05in"';

/**
 * Reads "name:value:tolerance" (tolerance optional, 0 when left out). Value and tolerance accept
 * the same units as parseLength. The name may itself contain ":"; the last two fields are numbers.
 */
export function parseDimension(text: string): Parsed<DimensionQuery> {
  const fields = text.split(':');
  if (fields.length < 2) {
    return { ok: false, message: `Write a key dimension as name:value:tolerance, ${DIM_EXAMPLE}.` };
  }
  const three = fields.length >= 3;
  const name = (three ? fields.slice(0, -2) : fields.slice(0, -1)).join(':').trim().replace(/\s+/g, ' ');
  const valueText = (three ? fields[fields.length - 2] : fields[fields.length - 1]).trim();
  const tolText = three ? fields[fields.length - 1].trim() : '0';
  if (name.length < 2) return { ok: false, message: `Name the dimension before the value, ${DIM_EXAMPLE}.` };
  if (name.length > 60) return { ok: false, message: 'Keep the dimension name under 60 characters.' };
  const valueMm = parseLength(valueText);
  if (valueMm === null) return { ok: false, message: `"${valueText}" is not a length. Write the value like 15, 15.2mm or 0.6in, ${DIM_EXAMPLE}.` };
  if (valueMm <= 0) return { ok: false, message: 'The value must be more than 0 mm.' };
  if (valueMm > MAX_DIMENSION_MM) return { ok: false, message: `"${valueText}" is more than 2 m; check the unit.` };
  const tolMm = parseLength(tolText);
  if (tolMm === null) return { ok: false, message: `"${tolText}" is not a tolerance. Write it like 0.3, 0.3mm or 0.01in, ${DIM_EXAMPLE}.` };
  if (tolMm > MAX_TOLERANCE_MM) return { ok: false, message: 'A tolerance over 50 mm is not a key dimension.' };
  return { ok: true, value: { name, valueMm, tolMm } };
}

/** Query parameters may repeat (?mount=a&mount=b) or hold a comma-separated list (?mount=a,b). */
export function splitList(value: string | string[] | undefined): string[] {
  if (value === undefined) return [];
  const items = (Array.isArray(value) ? value : [value]).flatMap((v) => v.split(','));
  return [...new Set(items.map((v) => v.trim()).filter(Boolean))];
}
