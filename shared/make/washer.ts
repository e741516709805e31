import { z } from 'zod';
import type { Generator } from './types';
import { choiceOf, formatMm, lengthMm, resolution, roundMm } from './params';
import { CLEARANCE_HOLE_MM, CLEARANCE_STANDARD, CLEARANCES, clearanceName, HEAD_DIAMETER_MM, NUT_ACROSS_FLATS_MM, SCREW_LABELS, SCREWS } from './fasteners';
import { circlePath, extrude, holePath, meshOf, region, reversed, SizeBook, stackLayers, type Vec2 } from './solid';
import { circleSides } from './params';

const MIN_WALL_MM = 1;
const MIN_FLOOR_MM = 0.6;
/** Room around a nut or a screw head in its pocket (common practice for printed parts). */
const POCKET_PLAY_MM = 0.3;

export const washerSchema = z
  .object({
    screw: choiceOf('Screw', SCREWS).default('1/4-20'),
    clearance: choiceOf('Clearance', CLEARANCES).default('normal'),
    outerDiameterMm: lengthMm('Outside diameter', 4, 120).default(12),
    thicknessMm: lengthMm('Thickness', 0.4, 60).default(2),
    recess: choiceOf('Recess', ['none', 'counterbore', 'hex'] as const).default('none'),
    recessDepthMm: lengthMm('Recess depth', 0.4, 40).default(2),
    resolution: resolution.default('default'),
  })
  .superRefine((p, ctx) => {
    const hole = CLEARANCE_HOLE_MM[p.screw][p.clearance];
    const inner = p.recess === 'none' ? hole : recessDiameter(p.screw, p.recess);
    if (p.outerDiameterMm < inner + 2 * MIN_WALL_MM) {
      ctx.addIssue({
        code: 'custom',
        path: ['outerDiameterMm'],
        message: `Outside diameter must be at least ${formatMm(inner + 2 * MIN_WALL_MM)} for a ${SCREW_LABELS[p.screw]} ${p.recess === 'none' ? 'hole' : p.recess === 'hex' ? 'nut pocket' : 'counterbore'} with a 1 mm wall.`,
      });
    }
    if (p.recess !== 'none' && p.recessDepthMm > p.thicknessMm - MIN_FLOOR_MM) {
      ctx.addIssue({
        code: 'custom',
        path: ['recessDepthMm'],
        message: `Recess depth can be at most ${formatMm(p.thicknessMm - MIN_FLOOR_MM)} so ${formatMm(MIN_FLOOR_MM)} of floor stays under it.`,
      });
    }
  });

export type WasherParams = z.output<typeof washerSchema>;

function recessDiameter(screw: WasherParams['screw'], recess: 'counterbore' | 'hex'): number {
  // A hex pocket's corners: across flats / cos 30°.
  if (recess === 'hex') return (NUT_ACROSS_FLATS_MM[screw] + POCKET_PLAY_MM) / Math.cos(Math.PI / 6);
  return HEAD_DIAMETER_MM[screw] + 2 * POCKET_PLAY_MM;
}

export const washer: Generator<typeof washerSchema> = {
  kind: 'washer',
  title: 'Washer or spacer',
  summary:
    'A flat ring for one screw, with the clearance hole from the standard table, any outside size and thickness, and an optional counterbore or nut pocket.',
  schema: washerSchema,
  defaults: { screw: '1/4-20', clearance: 'normal', outerDiameterMm: 12, thicknessMm: 2, recess: 'none', recessDepthMm: 2, resolution: 'default' },
  fields: [
    { key: 'screw', label: 'Screw', kind: 'choice', options: SCREWS.map((s) => ({ value: s, label: SCREW_LABELS[s] })) },
    {
      key: 'clearance',
      label: 'Clearance',
      kind: 'choice',
      options: CLEARANCES.map((c) => ({ value: c, label: c })),
      help: 'ASME B18.2.8 for inch screws, ISO 273 fine / medium / coarse for metric.',
    },
    { key: 'outerDiameterMm', label: 'Outside diameter', kind: 'length', unit: 'mm', min: 4, max: 120, step: 0.1 },
    { key: 'thicknessMm', label: 'Thickness', kind: 'length', unit: 'mm', min: 0.4, max: 60, step: 0.1 },
    {
      key: 'recess',
      label: 'Recess',
      kind: 'choice',
      options: [
        { value: 'none', label: 'none' },
        { value: 'counterbore', label: 'counterbore for a socket head' },
        { value: 'hex', label: 'hex nut pocket' },
      ],
    },
    { key: 'recessDepthMm', label: 'Recess depth', kind: 'length', unit: 'mm', min: 0.4, max: 40, step: 0.1 },
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
    const p = washerSchema.parse(input);
    const book = new SizeBook(corrections);
    const nominalHole = CLEARANCE_HOLE_MM[p.screw][p.clearance];
    const hole = book.hole('Hole', nominalHole);
    const od = book.outer('Outside diameter', p.outerDiameterMm);
    book.notes.push(
      `Clearance hole ${formatMm(nominalHole)} for ${SCREW_LABELS[p.screw]}, ${clearanceName(p.screw, p.clearance)} (${CLEARANCE_STANDARD[p.screw]}).`,
    );
    const outline = circlePath(od, p.resolution);
    const holeLoop = holePath(hole, p.resolution);
    let mesh;
    if (p.recess === 'none') {
      mesh = meshOf(extrude(region(outline, [holeLoop]), p.thicknessMm));
    } else {
      const depth = p.recessDepthMm;
      let pocket: Vec2[];
      if (p.recess === 'hex') {
        const corner = book.hole('Nut pocket corners', recessDiameter(p.screw, 'hex')) / 2;
        pocket = [0, 5, 4, 3, 2, 1].map((k) => [corner * Math.cos((k * Math.PI) / 3), corner * Math.sin((k * Math.PI) / 3)] as Vec2);
      } else {
        pocket = holePath(book.hole('Counterbore', recessDiameter(p.screw, 'counterbore')), p.resolution);
      }
      mesh = stackLayers(
        [
          { region: region(outline, [holeLoop]), z0: 0, z1: p.thicknessMm - depth },
          { region: region(outline, [pocket]), z0: p.thicknessMm - depth, z1: p.thicknessMm },
        ],
        [{ up: region(reversed(pocket), [holeLoop]) }],
      );
      book.notes.push(`${p.recess === 'hex' ? 'Nut pocket' : 'Counterbore'} ${formatMm(depth)} deep on the top face.`);
    }
    const warnings: string[] = [];
    if (od - hole < 2 * 1.5) warnings.push('The ring is under 1.5 mm wide on each side; it may crack when the screw is tightened.');
    return {
      mesh,
      drawn: {
        parameters: { ...p, holeMm: roundMm(hole), outerDiameterMm: roundMm(od), segments: circleSides(od, p.resolution) },
        sizes: book.sizes,
        notes: book.notes,
      },
      warnings,
      // A washer sits in a screw joint that may carry gear: it is part of the load path.
      loadBearing: true,
      shells: 1,
      boundsMm: [od, od, p.thicknessMm],
    };
  },
};
