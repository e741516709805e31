// Filters and facet counts of the shelf search. Pure: the server applies them to its in-memory
// documents, and a client may run them on results it already holds.
import type { DimensionQuery, Envelope } from './query';

export type SizeMm = readonly [number, number, number];

/** The part of a search document the filters look at. */
export interface FilterableDoc {
  category: string;
  bodies: readonly { slug: string }[];
  mounts: readonly { slug: string }[];
  materials: readonly string[];
  sizeMm: SizeMm | null;
  keyDimensions: readonly KeyDimension[];
  adaptable: boolean;
  rating: number | null;
}

export interface KeyDimension {
  name: string;
  valueMm: number;
  /** The part's own tolerance (±); 0 when it states none. */
  tolMm?: number;
}

export interface SearchFilters {
  body?: readonly string[];
  mount?: readonly string[];
  category?: readonly string[];
  material?: readonly string[];
  fit?: Envelope;
  dim?: readonly DimensionQuery[];
  adaptable?: boolean;
  minRating?: number;
}

// Envelopes are compared to the micrometre: model sizes come from float32 mesh coordinates, whose
// noise (about 1e-5 mm at 100 mm) must not decide whether a 120 mm part fits a 120 mm space.
const micrometres = (mm: number) => Math.round(mm * 1e3);
// Key dimensions are typed by people as decimals or inch fractions (1/64 in = 0.396875 mm): exact
// in nanometres, so 15.3 − 15 ≤ 0.3 holds in integers where it fails in floating point.
const nanometres = (mm: number) => Math.round(mm * 1e6);

/**
 * Whether a part's bounding box fits inside the envelope when it may be turned to any axis order.
 * Sorting both and comparing side by side is the same as trying all six orders: if the sorted
 * sides fit, that order works; if some order works, the k-th smallest side of the part is at most
 * the k-th smallest side of the envelope (tests/unit/search-filters.test.ts checks it by brute force).
 */
export function fitsWithin(sizeMm: SizeMm, envelope: SizeMm): boolean {
  const part = sizeMm.map(micrometres).sort((a, b) => a - b);
  const space = envelope.map(micrometres).sort((a, b) => a - b);
  return part.every((side, i) => side <= space[i]);
}

export function normaliseDimensionName(name: string): string {
  return name.trim().replace(/\s+/g, ' ').toLowerCase();
}

const namedLike = (d: KeyDimension, asked: DimensionQuery) => normaliseDimensionName(d.name).includes(normaliseDimensionName(asked.name));

/**
 * How far a part's key dimension is from the asked one, or null when the two do not overlap.
 *
 * The rule: each side is a range, its value ± its own tolerance. The part matches when the two
 * ranges overlap, that is when |part value − asked value| ≤ part tolerance + asked tolerance;
 * ranges that only touch match (the edge is included). Compared in whole nanometres so inch
 * fractions and decimals land exactly on the edge.
 *
 * Worked example: searching a 15 mm rod bore ± 0.1 asks for [14.9, 15.1]. A clamp whose bore is
 * 15.2 ± 0.2 covers [15.0, 15.4]: |15.2 − 15| = 0.2 ≤ 0.2 + 0.1 = 0.3, so it matches, at distance
 * 0.2. A clip of 15.3 ± 0.0 covers [15.3, 15.3]: 0.3 ≤ 0 + 0.1 fails, so it does not; at ± 0.2 it
 * would touch (0.3 ≤ 0.3) and match. Among matches the closer nominal value ranks first.
 */
export function keyDimensionDistance(d: KeyDimension, asked: DimensionQuery): number | null {
  if (!namedLike(d, asked)) return null;
  const gap = Math.abs(nanometres(d.valueMm) - nanometres(asked.valueMm));
  return gap <= nanometres(d.tolMm ?? 0) + nanometres(asked.tolMm) ? gap / 1e6 : null;
}

/** Whether any of the part's key dimensions named like the asked one overlaps it (keyDimensionDistance). */
export function matchesKeyDimension(dims: readonly KeyDimension[], asked: DimensionQuery): boolean {
  return dims.some((d) => keyDimensionDistance(d, asked) !== null);
}

/** Summed distance of the closest matching dimension for each asked one (0 with none asked), for ranking. */
export function dimensionCloseness(dims: readonly KeyDimension[], asked: readonly DimensionQuery[]): number {
  let total = 0;
  for (const a of asked) {
    let best = Infinity;
    for (const d of dims) {
      const gap = keyDimensionDistance(d, a);
      if (gap !== null && gap < best) best = gap;
    }
    total += best;
  }
  return total;
}

// plain loops: these run for every document of a large result, so they allocate nothing
function anySlug(wanted: readonly string[] | undefined, have: readonly { slug: string }[]): boolean {
  if (!wanted?.length) return true;
  for (const item of have) if (wanted.includes(item.slug)) return true;
  return false;
}

function anyOf(wanted: readonly string[] | undefined, have: readonly string[]): boolean {
  if (!wanted?.length) return true;
  for (const item of have) if (wanted.includes(item)) return true;
  return false;
}

/**
 * One filter: every kind given must hold (AND); several values of one kind mean any of them (OR).
 * A part with no measured size never fits an envelope; one with no rating never meets minRating > 0.
 */
export function matchesFilters(doc: FilterableDoc, f: SearchFilters): boolean {
  if (f.category?.length && !f.category.includes(doc.category)) return false;
  if (!anySlug(f.body, doc.bodies)) return false;
  if (!anySlug(f.mount, doc.mounts)) return false;
  if (!anyOf(f.material, doc.materials)) return false;
  if (f.adaptable !== undefined && doc.adaptable !== f.adaptable) return false;
  if (f.minRating !== undefined && f.minRating > 0 && (doc.rating === null || doc.rating < f.minRating)) return false;
  if (f.fit && (!doc.sizeMm || !fitsWithin(doc.sizeMm, f.fit))) return false;
  for (const d of f.dim ?? []) if (!matchesKeyDimension(doc.keyDimensions, d)) return false;
  return true;
}

export interface FacetCounts {
  mount: Record<string, number>;
  body: Record<string, number>;
  category: Record<string, number>;
  material: Record<string, number>;
}

/**
 * How many of the given documents carry each value. Every document has one category, so those
 * counts add up to the number of documents; a document counts once per distinct mount, body and
 * material it lists.
 */
export function countFacets(docs: Iterable<FilterableDoc>): FacetCounts {
  const counts = {
    mount: new Map<string, number>(),
    body: new Map<string, number>(),
    category: new Map<string, number>(),
    material: new Map<string, number>(),
  };
  const bump = (into: Map<string, number>, key: string) => into.set(key, (into.get(key) ?? 0) + 1);
  // a value listed twice on one document counts once: only bump its first occurrence
  const bumpEach = <T>(into: Map<string, number>, items: readonly T[], keyOf: (item: T) => string) => {
    for (let i = 0; i < items.length; i++) {
      const key = keyOf(items[i]);
      let earlier = false;
      for (let j = 0; j < i && !earlier; j++) earlier = keyOf(items[j]) === key;
      if (!earlier) bump(into, key);
    }
  };
  const slug = (x: { slug: string }) => x.slug;
  const self = (x: string) => x;
  for (const doc of docs) {
    bump(counts.category, doc.category);
    bumpEach(counts.mount, doc.mounts, slug);
    bumpEach(counts.body, doc.bodies, slug);
    bumpEach(counts.material, doc.materials, self);
  }
  return {
    mount: Object.fromEntries(counts.mount),
    body: Object.fromEntries(counts.body),
    category: Object.fromEntries(counts.category),
    material: Object.fromEntries(counts.material),
  };
}
