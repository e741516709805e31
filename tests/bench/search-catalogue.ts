// An invented shelf for the search benchmark: plausible part titles from word lists (part types ×
// mount standards × made-up camera bodies × materials), sizes and key dimensions. Seeded, so every
// process of one run builds the same catalogue. No real makers, bodies or products.
import { CATEGORIES, MOUNT_STANDARDS } from '../../shared/catalogue';
import { adaptationRule, LICENCE_IDS } from '../../shared/licences';
import { MATERIAL_IDS } from '../../shared/materials';
import type { SearchQueryInput } from '../../shared/schemas/search';
import type { SearchBody, SearchDocument } from '../../server/modules/search/index-builder';

function mulberry32(seed: number) {
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const MAKERS = ['Korvel', 'Halden Cine', 'Ostrava Imaging', 'Marlinworks', 'Peregrine Digital', 'Quillon', 'Brask Cine', 'Veltmark', 'Noorden Imaging', 'Salix Camera Works'];
const MODEL_STEMS = ['KX', 'H', 'Vega S', 'M-Cam ', 'P', 'Q', 'BR', 'VT', 'N', 'SX'];

export function inventedBodies(): SearchBody[] {
  const bodies: SearchBody[] = [];
  MAKERS.forEach((maker, m) => {
    for (const n of [2, 4, 6, 8, 35, 60]) {
      const model = `${MODEL_STEMS[m]}${n}${n === 60 ? ' Mini' : ''}`;
      bodies.push({
        slug: `${maker}-${model}`.toLowerCase().replace(/[^a-z0-9]+/g, '-'),
        maker,
        model,
        aliases: [model.replace(/[^A-Za-z0-9]/g, ''), `${maker.split(' ')[0]} ${n}`],
      });
    }
  });
  return bodies;
}

interface PartType {
  noun: string;
  category: string;
  mounts: string[];
  dims: [string, number, number][];
}

const PART_TYPES: PartType[] = [
  { noun: 'battery plate adapter', category: 'power-batteries', mounts: ['battery-v-style', 'battery-3-stud', 'rods-15-60'], dims: [['plate width', 95, 0.3]] },
  { noun: 'battery belt hook', category: 'power-batteries', mounts: ['battery-v-style'], dims: [] },
  { noun: 'monitor bracket', category: 'monitors-video', mounts: ['screw-1-4-20', 'accessory-shoe', 'rail-1913'], dims: [['screw hole', 6.5, 0.1]] },
  { noun: 'receiver cradle', category: 'monitors-video', mounts: ['rods-15-60', 'accessory-shoe'], dims: [['rod bore', 15.2, 0.2]] },
  { noun: 'monitor yoke', category: 'monitors-video', mounts: ['screw-3-8-16', 'screw-1-4-20'], dims: [] },
  { noun: 'cable clip', category: 'cable-management', mounts: ['rods-15-60', 'rods-19-104', 'rail-1913'], dims: [['cable slot', 6, 0.5]] },
  { noun: 'cable strain relief', category: 'cable-management', mounts: ['accessory-shoe'], dims: [] },
  { noun: 'follow-focus gear ring', category: 'lens-focus', mounts: ['gear-0-8'], dims: [['inner diameter', 80, 0.2]] },
  { noun: 'lens support', category: 'lens-focus', mounts: ['rods-15-60', 'rods-19-104'], dims: [['rod bore', 15.3, 0.1]] },
  { noun: 'rod clamp', category: 'rods-mounting', mounts: ['rods-15-60', 'rods-15-100', 'rods-19-104'], dims: [['rod bore', 15.2, 0.2]] },
  { noun: 'bridge plate', category: 'rods-mounting', mounts: ['dovetail-38', 'rods-15-100'], dims: [['plate width', 101.6, 0.2]] },
  { noun: 'cheese plate', category: 'rods-mounting', mounts: ['screw-1-4-20', 'screw-3-8-16'], dims: [['screw hole', 6.5, 0.1]] },
  { noun: 'riser block', category: 'shoe-top', mounts: ['screw-1-4-20', 'accessory-shoe'], dims: [['riser height', 20, 0.2]] },
  { noun: 'top handle', category: 'shoe-top', mounts: ['screw-1-4-20', 'screw-3-8-16', 'rail-1913'], dims: [] },
  { noun: 'cold-shoe adapter', category: 'shoe-top', mounts: ['accessory-shoe'], dims: [['foot width', 18.6, 0.1]] },
  { noun: 'port cap', category: 'protection-caps', mounts: ['other'], dims: [['plug diameter', 9, 0.1]] },
  { noun: 'shoe cover', category: 'protection-caps', mounts: ['accessory-shoe'], dims: [['foot width', 18.6, 0.1]] },
  { noun: 'matte box spacer', category: 'protection-caps', mounts: ['rods-15-60'], dims: [] },
  { noun: 'media card case', category: 'cases-storage', mounts: [], dims: [['slot width', 24, 0.3]] },
  { noun: 'slate light holder', category: 'cases-storage', mounts: ['screw-1-4-20'], dims: [] },
  { noun: 'lens cap keeper', category: 'cases-storage', mounts: [], dims: [['cap diameter', 95, 0.5]] },
];

const ADJECTIVES = ['compact', 'low-profile', 'quick-release', 'heavy-duty', 'slim', 'offset', 'angled', 'dual', 'tool-free', 'vented', 'folding', 'stackable'];
const SENTENCES = [
  'Print it flat on the bed with the clamp face down.',
  'Uses an M4 thumb screw and a captive nut.',
  'Held up through a week of handheld work in the rain.',
  'The bore is drawn slightly undersize so it grips after printing.',
  'Add a safety cable when it goes overhead.',
  'Keeps the battery cable away from the lens.',
  'Works on the top rod or the bottom rods.',
  'Tested on a long day in a parked car.',
  'The slot takes a strip of camera tape for a label.',
  'Sand the contact face lightly before the first use.',
  'A second version with a longer arm is on the way.',
  'The monitor sits at eye height for the focus puller.',
];

export function inventedCatalogue(n: number, seed = 42): SearchDocument[] {
  const rand = mulberry32(seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const bodies = inventedBodies();
  const start = Date.UTC(2024, 0, 1);
  const docs: SearchDocument[] = [];
  for (let id = 1; id <= n; id++) {
    const type = pick(PART_TYPES);
    const adjective = pick(ADJECTIVES);
    const partBodies = rand() < 0.6 ? [...new Set(Array.from({ length: 1 + Math.floor(rand() * 3) }, () => pick(bodies)))] : [];
    const mountSlugs = type.mounts.length ? [...new Set(Array.from({ length: 1 + Math.floor(rand() * 2) }, () => pick(type.mounts)))] : [];
    const mounts = mountSlugs.map((slug) => (slug === 'other' ? { slug, note: 'Fits the 4-pin power port' } : { slug }));
    const mountLabel = mountSlugs.length ? MOUNT_STANDARDS.find((m) => m.slug === mountSlugs[0])!.label : '';
    const materials = [...new Set([pick(['PETG', 'PETG', 'PLA', 'ASA', 'TPU', 'PA-CF'] as const), ...(rand() < 0.3 ? [pick(MATERIAL_IDS)] : [])])];
    const title =
      partBodies.length && rand() < 0.5
        ? `${adjective[0].toUpperCase()}${adjective.slice(1)} ${type.noun} for the ${partBodies[0].maker} ${partBodies[0].model}`
        : `${type.noun[0].toUpperCase()}${type.noun.slice(1)}, ${adjective}${mountLabel && rand() < 0.5 ? ` (${mountLabel})` : ''}`;
    const licence = pick(LICENCE_IDS);
    const size = [10 + rand() * 190, 10 + rand() * 120, 5 + rand() * 60].map((v) => Math.round(v * 10) / 10) as [number, number, number];
    docs.push({
      id,
      slug: `part-${id}`,
      title,
      summary: `A ${adjective} ${type.noun} printed in ${materials[0]}${partBodies.length ? ` for the ${partBodies.map((b) => b.model).join(' and ')}` : ''}.`,
      description: Array.from({ length: 2 + Math.floor(rand() * 4) }, () => pick(SENTENCES)).join(' '),
      category: type.category,
      bodies: partBodies,
      mounts,
      materials,
      keyDimensions: type.dims.map(([name, value, tol]) => ({ name, valueMm: Math.round((value + (rand() - 0.5) * 2) * 100) / 100, tolMm: tol })),
      sizeMm: rand() < 0.97 ? size : null,
      thumbnail: rand() < 0.8 ? `/api/parts/${id}/files/${id * 3}/image/thumb` : null,
      licence,
      adaptable: adaptationRule(licence).allowed,
      publishedAt: new Date(start + id * 600_000).toISOString(),
      publishedRevisionId: id,
      rating: null,
    });
  }
  // keep the invented categories honest against the real list
  for (const d of docs) if (!CATEGORIES.some((c) => c.slug === d.category)) throw new Error(`unknown category ${d.category}`);
  return docs;
}

export type QueryKind = 'text' | 'text+filters' | 'filters' | 'envelope';

/** The fixed, mixed query set: the same queries for every contender and every catalogue size. */
export const BENCH_QUERIES: { kind: QueryKind; query: SearchQueryInput }[] = [
  { kind: 'text', query: { q: 'battery plate' } },
  { kind: 'text', query: { q: 'monitor bracket' } },
  { kind: 'text', query: { q: 'Korvel KX8 top handle' } },
  { kind: 'text', query: { q: 'baterry' } },
  { kind: 'text', query: { q: 'quarter inch riser' } },
  { kind: 'text', query: { q: 'follow focus gear' } },
  { kind: 'text', query: { q: 'cable cl' } },
  { kind: 'text', query: { q: 'LWS lens support' } },
  { kind: 'text+filters', query: { q: 'bracket', mount: 'screw-1-4-20', material: 'PETG' } },
  { kind: 'text+filters', query: { q: 'plate', category: 'power-batteries', adaptable: 'true' } },
  { kind: 'text+filters', query: { q: 'rod clamp', dim: 'rod bore:15:0.3' } },
  { kind: 'text+filters', query: { q: 'handle', body: 'quillon-q8' } },
  { kind: 'filters', query: { mount: 'rods-15-60' } },
  { kind: 'filters', query: { category: 'lens-focus', material: 'TPU' } },
  { kind: 'filters', query: { body: 'halden-cine-h6', mount: 'screw-1-4-20' } },
  { kind: 'filters', query: { dim: 'plate width:4in:0.05in' } },
  { kind: 'envelope', query: { fit: '120x80x40' } },
  { kind: 'envelope', query: { fit: '4.5in x 3in x 1in', q: 'adapter' } },
  { kind: 'envelope', query: { fit: '60x60x60', category: 'shoe-top' } },
  { kind: 'envelope', query: { fit: '200x100x50', mount: 'accessory-shoe', sort: 'newest' } },
];
