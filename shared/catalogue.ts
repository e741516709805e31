// Controlled vocabularies of the shelf: categories (our own list) and mount standards (each with the
// standard or convention it follows, and the words crews type for it).

export const CATEGORIES = [
  { slug: 'power-batteries', label: 'Power & batteries' },
  { slug: 'monitors-video', label: 'Monitors & video' },
  { slug: 'cable-management', label: 'Cable management' },
  { slug: 'lens-focus', label: 'Lens & focus' },
  { slug: 'rods-mounting', label: 'Rods & mounting' },
  { slug: 'shoe-top', label: 'Shoe & top' },
  { slug: 'protection-caps', label: 'Protection & caps' },
  { slug: 'cases-storage', label: 'Cases & storage' },
] as const;
export type CategorySlug = (typeof CATEGORIES)[number]['slug'];
export const CATEGORY_SLUGS = CATEGORIES.map((c) => c.slug) as [CategorySlug, ...CategorySlug[]];

export interface MountStandard {
  slug: string;
  label: string;
  /** The standard or convention the mount follows. */
  standard: string;
  aliases: string[];
}

export const MOUNT_STANDARDS = [
  {
    slug: 'screw-1-4-20',
    label: '1/4-20 UNC screw',
    standard: 'ISO 1222 (thread per ASME B1.1)',
    aliases: ['1/4-20', '1/4"', '1/4 inch', 'quarter inch', 'quarter-inch', 'tripod screw'],
  },
  { slug: 'screw-3-8-16', label: '3/8-16 UNC screw', standard: 'ISO 1222 (thread per ASME B1.1)', aliases: ['3/8-16', '3/8"', '3/8 inch', 'three-eighths'] },
  { slug: 'accessory-shoe', label: 'Accessory shoe', standard: 'ISO 518', aliases: ['cold shoe', 'coldshoe', 'hot shoe', 'shoe mount'] },
  {
    slug: 'rods-15-60',
    label: '15 mm rods at 60 mm',
    standard: 'Lightweight rod convention: 15 mm rods, 60 mm centres',
    aliases: ['15mm rods', '15 mm', 'lightweight rods', 'LWS', 'lightweight support'],
  },
  {
    slug: 'rods-15-100',
    label: '15 mm studio rods at 100 mm',
    standard: 'Studio rod convention: 15 mm rods, 100 mm centres',
    aliases: ['15mm studio', 'studio rods 15'],
  },
  {
    slug: 'rods-19-104',
    label: '19 mm rods at 104 mm',
    standard: 'Studio rod convention: 19 mm rods, 104 mm centres',
    aliases: ['19mm rods', '19 mm', 'studio rods'],
  },
  {
    slug: 'rail-1913',
    label: 'MIL-STD-1913 / NATO accessory rail',
    standard: 'MIL-STD-1913; STANAG 4694',
    aliases: ['picatinny', 'NATO rail', '1913 rail', 'accessory rail'],
  },
  {
    slug: 'dovetail-38',
    label: '38 mm dovetail clamp',
    standard: 'Common 38 mm (1.5 in) V-groove dovetail',
    aliases: ['dovetail', '38mm plate', 'quick release plate'],
  },
  {
    slug: 'battery-v-style',
    label: 'V-style battery plate',
    standard: 'V-style battery plate convention',
    aliases: ['v-mount', 'v mount', 'v plate', 'v-style'],
  },
  { slug: 'battery-3-stud', label: '3-stud battery plate', standard: '3-stud battery plate convention', aliases: ['3 stud', 'three stud', '3-stud'] },
  // Not 32 DP: 32 diametral pitch is module 25.4 / 32 = 0.79375, close to 0.8 but not equal, so
  // "32 pitch" is not an alias of this gear (see moduleOfDiametralPitch in units.ts).
  {
    slug: 'gear-0-8',
    label: '0.8 module gear',
    standard: 'ISO 53 basic rack, module 0.8 (32 DP is module 0.79375: close, but the two do not mesh over long runs)',
    aliases: ['0.8 mod', 'mod 0.8', 'lens gear', 'follow focus gear'],
  },
  { slug: 'other', label: 'Other (see note)', standard: 'Described in the note', aliases: [] },
] as const satisfies readonly MountStandard[];
export type MountSlug = (typeof MOUNT_STANDARDS)[number]['slug'];
export const MOUNT_SLUGS = MOUNT_STANDARDS.map((m) => m.slug) as [MountSlug, ...MountSlug[]];

export const SAFETY_FLAGS = [
  { key: 'carriesLoad', label: 'Carries load', hint: 'holds a monitor, battery, receiver or other weight' },
  { key: 'overhead', label: 'Used overhead', hint: 'anything above cast or crew' },
  { key: 'vehicle', label: 'Used on a vehicle', hint: 'car mounts, process trailers, vibration' },
  { key: 'heat', label: 'Exposed to heat or sun', hint: 'near lights, in a parked car, in direct sun' },
] as const;
export type SafetyFlag = (typeof SAFETY_FLAGS)[number]['key'];
export type SafetyFlags = Record<SafetyFlag, boolean>;

export function categoryLabel(slug: string): string {
  return CATEGORIES.find((c) => c.slug === slug)?.label ?? slug;
}

export function mountStandard(slug: string): MountStandard | undefined {
  return MOUNT_STANDARDS.find((m) => m.slug === slug);
}

/** URL-safe slug from a title: lower case ASCII words joined by hyphens. */
export function slugify(text: string): string {
  return (
    text
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 80)
      .replace(/-+$/, '') || 'part'
  );
}
