import { z } from 'zod';
import type { Generator } from './types';
import { choiceOf, formatMm, lengthMm, resolution, roundMm } from './params';
import { CLEARANCE_HOLE_MM, SCREW_LABELS } from './fasteners';
import { blockWithHoleAlongY, extrude, glue, meshOf, region, SizeBook, slottedBoreArc, type GluePlane, type Vec2 } from './solid';

/** Rod centres of the trade: 60 mm for 15 mm lightweight rods, 100 mm for 15 mm studio, 104 mm for 19 mm studio (secondary; no standard). */
export const ROD_CENTRES: Record<15 | 19, number[]> = { 15: [60, 100], 19: [104] };
/** Pinch slit and jaws (our choice): a 1.2 mm slit closed by an M3 screw through 8 mm jaws. */
const SLIT_HALF_MM = 0.6;
const JAW_LENGTH_MM = 8;
const EAR_WALL_MM = 3.5;
const M3_HOLE_MM = CLEARANCE_HOLE_MM.M3.normal;

export const rodClampSchema = z
  .object({
    rodMm: z.union([z.literal(15), z.literal(19)], { error: 'Rod diameter: choose 15 or 19 mm.' }).default(15),
    layout: choiceOf('Layout', ['single', 'pair'] as const).default('pair'),
    centresMm: z.union([z.literal(60), z.literal(100), z.literal(104)], { error: 'Rod centres: choose 60, 100 or 104 mm.' }).default(60),
    clearanceMm: lengthMm('Bore clearance', 0, 1).default(0.2),
    mount: choiceOf('Mounting hole', ['1/4-20', '3/8-16'] as const).default('1/4-20'),
    lengthMm: lengthMm('Clamp length along the rod', 14, 60).default(20),
    wallMm: lengthMm('Wall', 3, 10).default(4),
    resolution: resolution.default('default'),
  })
  .superRefine((p, ctx) => {
    const hole = CLEARANCE_HOLE_MM[p.mount].normal;
    if (p.lengthMm < hole + 4) {
      ctx.addIssue({
        code: 'custom',
        path: ['lengthMm'],
        message: `Clamp length must be at least ${formatMm(hole + 4)} to fit the ${SCREW_LABELS[p.mount]} hole with 2 mm around it.`,
      });
    }
    if (p.layout === 'pair') {
      const middle = p.centresMm - p.rodMm - p.clearanceMm - 2 * p.wallMm;
      if (middle < hole + 4) {
        ctx.addIssue({
          code: 'custom',
          path: ['wallMm'],
          message: `With ${p.rodMm} mm rods at ${p.centresMm} mm the wall can be at most ${formatMm((p.centresMm - p.rodMm - p.clearanceMm - hole - 4) / 2)} to leave room for the mounting hole.`,
        });
      }
    }
  });

export type RodClampParams = z.output<typeof rodClampSchema>;

/** One rod's body: a block round the bore with a slit out to the side `dir`, as an outline (counter-clockwise). */
function bodyOutline(cx: number, half: number, bore: number, dir: 1 | -1, res: RodClampParams['resolution']): Vec2[] {
  const s = SLIT_HALF_MM;
  const arc = slottedBoreArc(bore, res, s, [cx, 0], dir);
  const xo = cx + dir * half;
  const xi = cx - dir * half;
  if (dir === -1) return [[xo, -half], [xi, -half], [xi, half], [xo, half], [xo, s], ...arc, [xo, -s]];
  return [[xi, -half], [xo, -half], [xo, -s], ...arc, [xo, s], [xo, half], [xi, half]];
}

export const rodClamp: Generator<typeof rodClampSchema> = {
  kind: 'rod-clamp',
  title: 'Rod clamp',
  summary: 'A clamp for one 15 or 19 mm rod or a pair at 60, 100 or 104 mm centres, pinched by an M3 screw, with a 1/4-20 or 3/8-16 through hole for mounting.',
  schema: rodClampSchema,
  defaults: { rodMm: 15, layout: 'pair', centresMm: 60, clearanceMm: 0.2, mount: '1/4-20', lengthMm: 20, wallMm: 4, resolution: 'default' },
  fields: [
    {
      key: 'rodMm',
      label: 'Rod diameter',
      kind: 'choice',
      options: [
        { value: 15, label: '15 mm' },
        { value: 19, label: '19 mm' },
      ],
    },
    {
      key: 'layout',
      label: 'Rods',
      kind: 'choice',
      options: [
        { value: 'single', label: 'single rod' },
        { value: 'pair', label: 'pair' },
      ],
    },
    {
      key: 'centresMm',
      label: 'Rod centres',
      kind: 'choice',
      options: [60, 100, 104].map((c) => ({ value: c, label: `${c} mm` })),
      help: 'Pair only: 60 mm lightweight, 100 mm 15 mm studio, 104 mm 19 mm studio.',
    },
    { key: 'clearanceMm', label: 'Bore clearance', kind: 'length', unit: 'mm', min: 0, max: 1, step: 0.05 },
    {
      key: 'mount',
      label: 'Mounting hole',
      kind: 'choice',
      options: [
        { value: '1/4-20', label: '1/4-20' },
        { value: '3/8-16', label: '3/8-16' },
      ],
    },
    { key: 'lengthMm', label: 'Length along the rod', kind: 'length', unit: 'mm', min: 14, max: 60, step: 1 },
    { key: 'wallMm', label: 'Wall', kind: 'length', unit: 'mm', min: 3, max: 10, step: 0.5 },
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
    const p = rodClampSchema.parse(input);
    const book = new SizeBook(corrections);
    const bore = book.hole('Rod bore', p.rodMm + p.clearanceMm);
    const mountHole = book.hole(`${SCREW_LABELS[p.mount]} hole`, CLEARANCE_HOLE_MM[p.mount].normal);
    const pinchHole = book.hole('M3 pinch hole', M3_HOLE_MM);
    const half = (p.rodMm + p.clearanceMm) / 2 + p.wallMm;
    const L = p.lengthMm;
    const res = p.resolution;
    const warnings: string[] = [];
    const jaw = (xo: number, dir: 1 | -1) => {
      const x0 = dir === 1 ? xo : xo - JAW_LENGTH_MM;
      const x1 = dir === 1 ? xo + JAW_LENGTH_MM : xo;
      const hole = { diameterMm: pinchHole, x: (x0 + x1) / 2, z: L / 2 };
      return [blockWithHoleAlongY(x0, x1, SLIT_HALF_MM, half, 0, L, hole, res), blockWithHoleAlongY(x0, x1, -half, -SLIT_HALF_MM, 0, L, hole, res)];
    };
    let parts;
    let planes: GluePlane[];
    let width: number;
    if (p.layout === 'single') {
      const ear = mountHole + 2 * EAR_WALL_MM;
      parts = [
        extrude(region(bodyOutline(0, half, bore, -1, res)), L),
        blockWithHoleAlongY(half, half + ear, -half, half, 0, L, { diameterMm: mountHole, x: half + ear / 2, z: L / 2 }, res),
        ...jaw(-half, -1),
      ];
      planes = [
        { axis: 0, at: half },
        { axis: 0, at: -half },
      ];
      width = JAW_LENGTH_MM + 2 * half + ear;
      book.notes.push(`Single ${p.rodMm} mm rod; the ${SCREW_LABELS[p.mount]} hole runs through the ear beside it, square to the rod.`);
    } else {
      const c = p.centresMm / 2;
      parts = [
        extrude(region(bodyOutline(-c, half, bore, -1, res)), L),
        extrude(region(bodyOutline(c, half, bore, 1, res)), L),
        blockWithHoleAlongY(-c + half, c - half, -half, half, 0, L, { diameterMm: mountHole, x: 0, z: L / 2 }, res),
        ...jaw(-c - half, -1),
        ...jaw(c + half, 1),
      ];
      planes = [-c - half, -c + half, c - half, c + half].map((at) => ({ axis: 0 as const, at }));
      width = 2 * (c + half + JAW_LENGTH_MM);
      book.plain('Rod centres', p.centresMm);
      book.notes.push(
        `Pair of ${p.rodMm} mm rods at ${formatMm(p.centresMm)} centres; the ${SCREW_LABELS[p.mount]} hole runs through the middle, square to the rods.`,
      );
      if (!ROD_CENTRES[p.rodMm].includes(p.centresMm)) {
        warnings.push(`${p.rodMm} mm rods are not usually set at ${p.centresMm} mm (the trade uses ${ROD_CENTRES[p.rodMm].join(' or ')} mm); check your rig.`);
      }
    }
    book.notes.push(`Each bore is split by a ${formatMm(2 * SLIT_HALF_MM)} slit and pinched by an M3 screw and nut. Print with the rods standing upright.`);
    return {
      mesh: meshOf(glue(parts, planes)),
      drawn: {
        parameters: { ...p, boreMm: roundMm(bore), mountHoleMm: roundMm(mountHole) },
        sizes: book.sizes,
        notes: book.notes,
      },
      warnings,
      loadBearing: true,
      shells: 1,
      boundsMm: [width, 2 * half, L],
    };
  },
};
