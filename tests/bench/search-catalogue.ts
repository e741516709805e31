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

const MAKERS = [
  'Korvel',
  'Halden Cine',
  'Ostrava Imaging',
  'Marlinworks',
  'Peregrine Digital',
  'Quillon',
  'Brask Cine',
  'Veltmark',
  'Noorden Imaging',
  'Salix Camera Works',
];
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
  { noun: 'timecode box holder', category: 'monitors-video', mounts: ['accessory-shoe', 'screw-1-4-20'], dims: [['box width', 48, 0.3]] },
  { noun: 'transmitter bracket', category: 'monitors-video', mounts: ['screw-1-4-20', 'rods-15-60'], dims: [] },
  { noun: 'hand unit holster', category: 'lens-focus', mounts: ['rods-15-60'], dims: [['rod bore', 15.2, 0.2]] },
  { noun: 'focus marker disc', category: 'lens-focus', mounts: [], dims: [['disc diameter', 60, 0.2]] },
  { noun: 'lens motor bracket', category: 'lens-focus', mounts: ['rods-15-60', 'rods-19-104'], dims: [['rod bore', 19.2, 0.2]] },
  { noun: 'seamless gear', category: 'lens-focus', mounts: ['gear-0-8'], dims: [['inner diameter', 70, 0.2]] },
  { noun: 'rod end cap', category: 'protection-caps', mounts: ['rods-15-60'], dims: [['plug diameter', 12, 0.1]] },
  { noun: 'baseplate wedge', category: 'rods-mounting', mounts: ['dovetail-38', 'screw-3-8-16'], dims: [['plate width', 38, 0.2]] },
  { noun: 'NATO rail clamp', category: 'rods-mounting', mounts: ['rail-1913'], dims: [['rail width', 21.2, 0.1]] },
  { noun: 'eyepiece leveller', category: 'shoe-top', mounts: ['rods-15-60'], dims: [] },
  { noun: 'power tap splitter box', category: 'power-batteries', mounts: ['battery-v-style', 'battery-3-stud'], dims: [] },
  { noun: 'D-tap cable strain relief', category: 'cable-management', mounts: ['rail-1913'], dims: [['cable slot', 5, 0.3]] },
  { noun: 'SDI connector saver', category: 'cable-management', mounts: [], dims: [] },
  { noun: 'phone monitor mount', category: 'monitors-video', mounts: ['accessory-shoe', 'screw-1-4-20'], dims: [['clamp width', 75, 2]] },
  { noun: 'slate clip', category: 'cases-storage', mounts: [], dims: [] },
  { noun: 'filter tray shim', category: 'protection-caps', mounts: [], dims: [['tray thickness', 4, 0.1]] },
  { noun: 'battery cover', category: 'power-batteries', mounts: ['battery-v-style'], dims: [] },
  { noun: 'lens support riser', category: 'lens-focus', mounts: ['rods-15-60', 'screw-1-4-20'], dims: [['rod bore', 15.2, 0.2]] },
];

const ADJECTIVES = [
  'compact',
  'low-profile',
  'quick-release',
  'heavy-duty',
  'slim',
  'offset',
  'angled',
  'dual',
  'tool-free',
  'vented',
  'folding',
  'stackable',
  'ribbed',
  'split',
  'hinged',
  'locking',
  'padded',
  'lightweight',
  'reinforced',
  'modular',
  'swivel',
  'sliding',
  'clip-on',
  'snap-fit',
  'rounded',
  'flush',
  'long',
  'short',
  'wide',
  'narrow',
  'twin',
  'single',
  'universal',
  'keyed',
  'tapered',
  'counterbored',
];

// Sentence parts a contributor writes in a description; combined, they give the shelf a vocabulary
// of several hundred trade words instead of a few sentences repeated.
const VERBS = [
  'holds',
  'grips',
  'clamps',
  'carries',
  'protects',
  'guides',
  'locks',
  'lifts',
  'centres',
  'spaces',
  'routes',
  'keeps',
  'steadies',
  'covers',
  'stores',
  'hangs',
  'aligns',
  'braces',
];
const OBJECTS = [
  'the wireless video receiver',
  'a small director monitor',
  'the timecode box',
  'a spare battery',
  'the follow focus motor',
  'the lens motor cable',
  'an SDI cable',
  'the power tap lead',
  'the audio receiver',
  'a media card',
  'the eyepiece',
  'the top handle',
  'a focus marker disc',
  'the hand unit',
  'the filter tray',
  'a slate light',
  'the lens cap',
  'a tally lamp',
  'a distance sensor',
  'the cine tape measure',
  'the camera report pad',
  'a phone monitor',
  'the accessory arm',
  'the matte box flag',
  'a 4-pin power lead',
  'the BNC connectors',
  'a charger brick',
  'the lens light',
];
const CONTEXTS = [
  'on a car mount',
  'during handheld work',
  'on the dolly',
  'on a gimbal',
  'in the rain',
  'at the back of the cage',
  'under the baseplate',
  'beside the lens',
  'on the top rail',
  'on the bottom rods',
  'near the mattebox',
  'on a steadicam sled',
  'on a crane arm',
  'in a parked car',
  'on the camera cart',
  'for the focus puller',
  'for the operator',
  'for the loader',
  'in cold weather',
  'on long exterior days',
  'for studio builds',
  'on documentary shoots',
];
const PRINT_NOTES = [
  'Print it flat on the bed with the clamp face down.',
  'Uses an M4 thumb screw and a captive nut.',
  'Needs a heat-set insert for the M3 screw.',
  'Supports only under the overhang.',
  'Four perimeters and 40 % infill.',
  'Brim helps on the long edge.',
  'Sand the contact face lightly before the first use.',
  'The bore is drawn slightly undersize so it grips after printing.',
  'Add a safety cable when it goes overhead.',
  'Rubber pads stop it marking the rod.',
  'A second version with a longer arm is on the way.',
  'The slot takes a strip of camera tape for a label.',
  'Chamfered edges print without supports.',
  'Layer height 0.2 mm; slower outer walls look better.',
  'Drill the hole to size after printing for a tight fit.',
  'Print two and stack them for more height.',
];

export function inventedCatalogue(n: number, seed = 42): SearchDocument[] {
  const rand = mulberry32(seed);
  const cap = (text: string) => `${text[0].toUpperCase()}${text.slice(1)}`;
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
      description: [
        ...Array.from({ length: 1 + Math.floor(rand() * 3) }, () => `${cap(pick(VERBS))} ${pick(OBJECTS)} ${pick(CONTEXTS)}.`),
        ...Array.from({ length: 1 + Math.floor(rand() * 3) }, () => pick(PRINT_NOTES)),
      ].join(' '),
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
  // what crews type most: thread sizes, V-style, 15mm glued, typed dimensions, typos, body names
  { kind: 'text', query: { q: '1/4-20 cheese plate' } },
  { kind: 'text', query: { q: 'V-style battery plate' } },
  { kind: 'text', query: { q: 'v style' } },
  { kind: 'text', query: { q: '15mm rod clamp' } },
  { kind: 'text', query: { q: 'receiver bracket for v-style' } },
  { kind: 'text', query: { q: 'monitor battery plate adapter' } },
  { kind: 'text', query: { q: 'recievr cradle' } },
  { kind: 'text', query: { q: 'focus gear 80mm' } },
  { kind: 'text', query: { q: 'print' } },
  { kind: 'text', query: { q: 'cold shoe' } },
  { kind: 'text', query: { q: 'kx8 handle' } },
  { kind: 'text+filters', query: { q: 'rod clamp', dim: 'rod bore:15mm:0.1' } },
  { kind: 'text+filters', query: { q: 'lens support', dim: 'rod bore:15:0.2', mount: '15mm rods' } },
  { kind: 'text+filters', query: { q: 'cage bracket', body: 'KX8' } },
  { kind: 'filters', query: { body: 'Halden Cine H6' } },
];
