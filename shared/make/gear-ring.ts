import { z } from 'zod';
import type { GeneratedMesh, Generator } from './types';
import { choiceOf, circleSides, formatMm, lengthMm, resolution, roundMm, type Resolution } from './params';
import { CLEARANCE_HOLE_MM } from './fasteners';
import { blockWithHoleAlongY, circlePath, extrude, glue, holePath, meshOf, region, reversed, SizeBook, slottedBoreArc, stackLayers, type Vec2 } from './solid';

/** ISO 53 basic rack: 20° pressure angle, addendum 1.0·m, dedendum 1.25·m. */
export const PRESSURE_ANGLE_RAD = (20 * Math.PI) / 180;
export const ADDENDUM = 1.0;
export const DEDENDUM = 1.25;
export const MODULES = [0.5, 0.6, 0.8, 1.0] as const;

/** Clamp collar (our choice): a 7 mm band under the teeth, 1 mm wider than their tips, with two lugs for an M3 screw across the slot. */
const COLLAR_HEIGHT_MM = 7;
const SLOT_WIDTH_MM = 1.5;
const COLLAR_RIM_MM = 1;
const LUG_LENGTH_MM = 8;
const LUG_WIDTH_MM = 5;
const M3_HOLE_MM = CLEARANCE_HOLE_MM.M3.normal;

export const gearRingSchema = z.object({
  module: z.union([z.literal(0.5), z.literal(0.6), z.literal(0.8), z.literal(1.0)], { error: 'Module: choose 0.5, 0.6, 0.8 or 1.0.' }).default(0.8),
  barrelDiameterMm: lengthMm('Barrel diameter', 20, 200).default(82),
  widthMm: lengthMm('Ring width', 3, 30).default(8),
  wallMm: lengthMm('Wall under the teeth', 0.8, 8).default(1.5),
  fit: choiceOf('Fit', ['press', 'clamp'] as const).default('press'),
  interferenceMm: lengthMm('Press-fit interference', 0, 1).default(0.2),
  resolution: resolution.default('default'),
});

export type GearRingParams = z.output<typeof gearRingSchema>;

/** Fewest teeth whose root circle m·(z − 2.5) clears the barrel plus the wall on both sides. */
export function toothCountFor(moduleMm: number, barrelMm: number, wallMm: number): number {
  return Math.ceil((barrelMm + 2 * wallMm) / moduleMm + DEDENDUM * 2 - 1e-9);
}

export function gearDiameters(moduleMm: number, teeth: number) {
  return {
    pitchMm: moduleMm * teeth,
    outsideMm: moduleMm * (teeth + 2 * ADDENDUM),
    rootMm: moduleMm * (teeth - 2 * DEDENDUM),
    baseMm: moduleMm * teeth * Math.cos(PRESSURE_ANGLE_RAD),
  };
}

const involute = (alpha: number) => Math.tan(alpha) - alpha;

/**
 * Points of a spur gear's outline with involute flanks (no profile shift), counter-clockwise from
 * angle 0, which lies in the middle of a tooth space; the root circle runs between the teeth.
 * With `gapHalfWidthMm`, the outline stops where the lines y = ±gap meet the root circle (a slot).
 */
export function gearOutline(moduleMm: number, teeth: number, res: Resolution, gapHalfWidthMm = 0): Vec2[] {
  const { outsideMm, rootMm, baseMm } = gearDiameters(moduleMm, teeth);
  const ra = outsideMm / 2;
  const rf = rootMm / 2;
  const rb = baseMm / 2;
  // Half the tooth's angular thickness at radius R: the pitch circle carries half the circular pitch.
  const halfAngle = (R: number) => Math.PI / (2 * teeth) + involute(PRESSURE_ANGLE_RAD) - involute(Math.acos(Math.min(1, rb / R)));
  const flankPoints = res === 'fine' ? 10 : 5;
  const rStart = Math.max(rb, rf);
  const radii: number[] = [];
  for (let i = 0; i <= flankPoints; i++) radii.push(rStart + ((ra - rStart) * i) / flankPoints);
  const tipHalf = halfAngle(ra);
  const startHalf = halfAngle(rStart);
  const pitchAngle = (2 * Math.PI) / teeth;
  const rootStep = (2 * Math.PI) / circleSides(rootMm, res);
  const tipSteps = Math.max(1, Math.ceil((2 * tipHalf) / ((2 * Math.PI) / circleSides(outsideMm, res))));
  const at = (R: number, a: number): Vec2 => [R * Math.cos(a), R * Math.sin(a)];
  const rootArc = (from: number, to: number, pts: Vec2[]) => {
    const steps = Math.max(1, Math.ceil((to - from) / rootStep));
    for (let i = 1; i < steps; i++) pts.push(at(rf, from + ((to - from) * i) / steps));
  };
  const gapStart = gapHalfWidthMm > 0 ? Math.asin(gapHalfWidthMm / rf) : 0;
  const pts: Vec2[] = [];
  if (gapHalfWidthMm > 0) pts.push([Math.sqrt(rf * rf - gapHalfWidthMm ** 2), gapHalfWidthMm]);
  else pts.push(at(rf, 0));
  let previous = gapStart;
  for (let k = 0; k < teeth; k++) {
    const c = (k + 0.5) * pitchAngle;
    rootArc(previous, c - startHalf, pts);
    pts.push(at(rf, c - startHalf));
    if (rf < rb) pts.push(at(rb, c - startHalf));
    for (let i = 1; i < radii.length; i++) pts.push(at(radii[i], c - halfAngle(radii[i])));
    for (let i = 1; i < tipSteps; i++) pts.push(at(ra, c - tipHalf + (2 * tipHalf * i) / tipSteps));
    for (let i = radii.length - 1; i >= 1; i--) pts.push(at(radii[i], c + halfAngle(radii[i])));
    if (rf < rb) pts.push(at(rb, c + startHalf));
    pts.push(at(rf, c + startHalf));
    previous = c + startHalf;
  }
  rootArc(previous, 2 * Math.PI - gapStart, pts);
  if (gapHalfWidthMm > 0) pts.push([Math.sqrt(rf * rf - gapHalfWidthMm ** 2), -gapHalfWidthMm]);
  return pts;
}

/** Half the chord of the tooth space at the root circle, where a slot may cut without touching a flank. */
export function rootGapHalfWidth(moduleMm: number, teeth: number): number {
  const { rootMm, baseMm } = gearDiameters(moduleMm, teeth);
  const rf = rootMm / 2;
  const rStart = Math.max(baseMm / 2, rf);
  const startHalf = Math.PI / (2 * teeth) + involute(PRESSURE_ANGLE_RAD) - involute(Math.acos(Math.min(1, baseMm / 2 / rStart)));
  return rf * Math.sin(Math.PI / teeth - startHalf);
}

export const gearRing: Generator<typeof gearRingSchema> = {
  kind: 'gear-ring',
  title: 'Lens gear ring',
  summary:
    'A gear ring for a lens barrel as measured: involute teeth on the ISO 53 basic rack, tooth count chosen so the root clears the barrel and the wall, held by a press fit or an M3 clamp screw.',
  schema: gearRingSchema,
  defaults: { module: 0.8, barrelDiameterMm: 82, widthMm: 8, wallMm: 1.5, fit: 'press', interferenceMm: 0.2, resolution: 'default' },
  fields: [
    { key: 'module', label: 'Module', kind: 'choice', options: MODULES.map((m) => ({ value: m, label: `${m}${m === 0.8 ? ' (cine lenses)' : ''}` })) },
    { key: 'barrelDiameterMm', label: 'Barrel diameter (measured)', kind: 'length', unit: 'mm', min: 20, max: 200, step: 0.1 },
    { key: 'widthMm', label: 'Ring width', kind: 'length', unit: 'mm', min: 3, max: 30, step: 0.5 },
    { key: 'wallMm', label: 'Wall under the teeth', kind: 'length', unit: 'mm', min: 0.8, max: 8, step: 0.1 },
    {
      key: 'fit',
      label: 'Held by',
      kind: 'choice',
      options: [
        { value: 'press', label: 'press fit' },
        { value: 'clamp', label: 'clamp slot with an M3 screw' },
      ],
    },
    {
      key: 'interferenceMm',
      label: 'Press-fit interference',
      kind: 'length',
      unit: 'mm',
      min: 0,
      max: 1,
      step: 0.05,
      help: 'How much smaller than the barrel the bore is drawn (press fit only).',
    },
    {
      key: 'resolution',
      label: 'Resolution',
      kind: 'choice',
      options: [
        { value: 'default', label: 'default' },
        { value: 'fine', label: 'fine' },
      ],
    },
  ],
  generate(input, corrections) {
    const p = gearRingSchema.parse(input);
    const book = new SizeBook(corrections);
    const teeth = toothCountFor(p.module, p.barrelDiameterMm, p.wallMm);
    const d = gearDiameters(p.module, teeth);
    const nominalBore = p.fit === 'press' ? p.barrelDiameterMm - p.interferenceMm : p.barrelDiameterMm;
    const boreDrawn = book.hole('Bore', nominalBore);
    book.plain('Pitch diameter', d.pitchMm);
    book.plain('Outside diameter', d.outsideMm);
    book.plain('Root diameter', d.rootMm);
    book.notes.push(
      `${teeth} teeth of module ${p.module}: pitch diameter ${formatMm(d.pitchMm)}, outside ${formatMm(d.outsideMm)}, root ${formatMm(d.rootMm)} (ISO 53 basic rack, 20°).`,
    );
    if (p.fit === 'press') book.notes.push(`Press fit: bore ${formatMm(p.interferenceMm)} smaller than the ${formatMm(p.barrelDiameterMm)} barrel.`);
    if ((corrections?.outerMm ?? 0) !== 0) book.notes.push('Teeth are drawn to the module as given; the outer-size correction does not move them.');

    let mesh: GeneratedMesh;
    let height = p.widthMm;
    let boundsXY = d.outsideMm;
    const warnings: string[] = [];
    if (p.fit === 'clamp') {
      const gap = Math.min(SLOT_WIDTH_MM / 2, 0.8 * rootGapHalfWidth(p.module, teeth));
      const rc = d.outsideMm / 2 + COLLAR_RIM_MM;
      const lugEnd = rc + LUG_LENGTH_MM;
      const lugTop = gap + LUG_WIDTH_MM;
      const xc = Math.sqrt(rc * rc - lugTop * lugTop);
      // The collar is cut flat at x = xc where the lugs sit; circlePath starts at angle 0, so its
      // upper half comes first.
      const collarArc = circlePath(2 * rc, p.resolution).filter(([x, y]) => !(x > 0 && Math.abs(y) <= lugTop));
      const outerArc: Vec2[] = [[xc, lugTop], ...collarArc.filter(([, y]) => y > 0), ...collarArc.filter(([, y]) => y <= 0), [xc, -lugTop]];
      const collarC: Vec2[] = [[xc, gap], ...outerArc, [xc, -gap]];
      const outerC: Vec2[] = [[lugEnd, gap], [lugEnd, lugTop], ...outerArc, [lugEnd, -lugTop], [lugEnd, -gap]];
      const gearC = gearOutline(p.module, teeth, p.resolution, gap);
      const bore = slottedBoreArc(boreDrawn, p.resolution, gap);
      const collarRegion = region([...collarC, ...bore]);
      const gearRegion = region([...gearC, ...bore]);
      const stepUp = region([...outerC, ...reversed(gearC)]);
      const screwX = lugEnd - M3_HOLE_MM / 2 - 2;
      const screwHole = { diameterMm: M3_HOLE_MM, x: screwX, z: COLLAR_HEIGHT_MM / 2 };
      const collar = glue(
        [
          extrude(collarRegion, COLLAR_HEIGHT_MM),
          blockWithHoleAlongY(xc, lugEnd, gap, lugTop, 0, COLLAR_HEIGHT_MM, screwHole, p.resolution),
          blockWithHoleAlongY(xc, lugEnd, -lugTop, -gap, 0, COLLAR_HEIGHT_MM, screwHole, p.resolution),
        ],
        [{ axis: 0, at: xc }],
      );
      mesh = stackLayers(
        [
          { region: collarRegion, z0: 0, z1: COLLAR_HEIGHT_MM, solid: collar },
          { region: gearRegion, z0: COLLAR_HEIGHT_MM, z1: COLLAR_HEIGHT_MM + p.widthMm },
        ],
        [{ up: stepUp }],
      );
      height = p.widthMm + COLLAR_HEIGHT_MM;
      boundsXY = d.outsideMm + 2 * (COLLAR_RIM_MM + LUG_LENGTH_MM);
      book.notes.push(
        `Clamp: a ${formatMm(2 * gap)} slot through a tooth space, a ${formatMm(COLLAR_HEIGHT_MM)} collar under the teeth with lugs for an M3 screw and nut (${formatMm(M3_HOLE_MM)} hole, ISO 273 medium). Print collar down.`,
      );
      if (2 * gap < 0.8)
        warnings.push(`The clamp slot is only ${formatMm(2 * gap)} wide (it must fit between two teeth); clear it with a blade after printing.`);
    } else {
      const outline = gearOutline(p.module, teeth, p.resolution);
      mesh = meshOf(extrude(region(outline, [holePath(boreDrawn, p.resolution)]), p.widthMm));
      if (p.interferenceMm > 0.5) warnings.push('More than 0.5 mm of interference may split the ring or mark the barrel.');
    }
    const bore = boreDrawn;
    if (d.rootMm - bore < 2 * 0.8) warnings.push('The wall under the teeth is thin; the ring may crack on a press fit.');
    return {
      mesh,
      drawn: {
        parameters: {
          ...p,
          teeth,
          boreMm: roundMm(bore),
          pitchDiameterMm: roundMm(d.pitchMm),
          outsideDiameterMm: roundMm(d.outsideMm),
          rootDiameterMm: roundMm(d.rootMm),
        },
        sizes: book.sizes,
        notes: book.notes,
      },
      warnings,
      // Carries focus torque only; a ring that slips or splits drops no gear.
      loadBearing: false,
      shells: 1,
      boundsMm: [boundsXY, boundsXY, height],
    };
  },
};
