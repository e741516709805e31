import { z } from 'zod';
import type { Generator } from './types';
import { choiceOf, formatMm, lengthMm, resolution, roundMm } from './params';
import { CLEARANCE_HOLE_MM, SCREW_LABELS } from './fasteners';
import { extrudeAlongY, holeCircle, holePath, meshOf, outerCircle, profileOf, rect, region, reversed, SizeBook, stackLayers, type Vec2 } from './solid';

/**
 * Accessory shoe sizes after ISO 518 (nominal, from memory; confirm against the standard before
 * relying on them): the shoe's slot is about 18.6 mm wide and 2 mm high, its lips leave an opening
 * of about 12.5 mm, and a foot is about 18 mm long.
 */
export const SHOE = { slotWidthMm: 18.6, slotHeightMm: 2.0, lipOpeningMm: 12.5, footLengthMm: 18 } as const;
/** Neck under the foot (our choice): 0.5 mm narrower than the lip opening, 2.5 mm tall, 1 mm short of the foot's ends. */
const NECK_HEIGHT_MM = 2.5;
const NECK_MARGIN_MM = 0.5;
const ROD_WALL_MM = 3;
const ROD_OPENING_RATIO = 0.85;

export const shoeFootSchema = z.object({
  mount: choiceOf('Mounting', ['1/4-20', '3/8-16', 'rod15', 'rod19'] as const).default('1/4-20'),
  playMm: lengthMm('Play in the shoe', 0, 0.6).default(0.2),
  baseSizeMm: lengthMm('Base size', 20, 40).default(24),
  baseHeightMm: lengthMm('Base height', 4, 20).default(6),
  resolution: resolution.default('default'),
});

export type ShoeFootParams = z.output<typeof shoeFootSchema>;

const rectPath = (x0: number, y0: number, x1: number, y1: number): Vec2[] => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
];

export const shoeFoot: Generator<typeof shoeFootSchema> = {
  kind: 'shoe-foot',
  title: 'Accessory-shoe foot',
  summary: 'A foot that slides into an accessory shoe (ISO 518 nominal sizes), on a base with a 1/4-20 or 3/8-16 hole or on a clip for a 15 or 19 mm rod.',
  schema: shoeFootSchema,
  defaults: { mount: '1/4-20', playMm: 0.2, baseSizeMm: 24, baseHeightMm: 6, resolution: 'default' },
  fields: [
    {
      key: 'mount',
      label: 'Mounting',
      kind: 'choice',
      options: [
        { value: '1/4-20', label: '1/4-20 hole' },
        { value: '3/8-16', label: '3/8-16 hole' },
        { value: 'rod15', label: 'clip for a 15 mm rod' },
        { value: 'rod19', label: 'clip for a 19 mm rod' },
      ],
    },
    {
      key: 'playMm',
      label: 'Play in the shoe',
      kind: 'length',
      unit: 'mm',
      min: 0,
      max: 0.6,
      step: 0.05,
      help: 'Taken off the foot width; half of it off the thickness.',
    },
    { key: 'baseSizeMm', label: 'Base size', kind: 'length', unit: 'mm', min: 20, max: 40, step: 1 },
    { key: 'baseHeightMm', label: 'Base height', kind: 'length', unit: 'mm', min: 4, max: 20, step: 0.5 },
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
    const p = shoeFootSchema.parse(input);
    const book = new SizeBook(corrections);
    const res = p.resolution;
    const footW = book.outer('Foot width', SHOE.slotWidthMm - p.playMm);
    const footT = book.outer('Foot thickness', SHOE.slotHeightMm - p.playMm / 2);
    const footL = SHOE.footLengthMm;
    const neckW = SHOE.lipOpeningMm - NECK_MARGIN_MM - p.playMm;
    book.plain('Neck width', neckW);
    book.notes.push(
      `Shoe sizes after ISO 518, nominal and from memory: slot ${formatMm(SHOE.slotWidthMm)} × ${formatMm(SHOE.slotHeightMm)}, lip opening ${formatMm(SHOE.lipOpeningMm)}. Check the fit on your shoe.`,
    );
    const warnings: string[] = [];
    let mesh;
    let bounds: [number, number, number];
    if (p.mount === '1/4-20' || p.mount === '3/8-16') {
      const holeD = book.hole(`${SCREW_LABELS[p.mount]} hole`, CLEARANCE_HOLE_MM[p.mount].normal);
      if (neckW - holeD < 2 * 1.2)
        warnings.push(
          `The neck round the ${SCREW_LABELS[p.mount]} hole is only ${formatMm((neckW - holeD) / 2)} thick; it may crack when the screw is tightened.`,
        );
      const hole = holePath(holeD, res);
      const B = p.baseSizeMm;
      const base = rectPath(-B / 2, -B / 2, B / 2, B / 2);
      const neck = rectPath(-neckW / 2, -(footL / 2 - 1), neckW / 2, footL / 2 - 1);
      const foot = rectPath(-footW / 2, -footL / 2, footW / 2, footL / 2);
      const z1 = p.baseHeightMm;
      const z2 = z1 + NECK_HEIGHT_MM;
      mesh = stackLayers(
        [
          { region: region(base, [hole]), z0: 0, z1 },
          { region: region(neck, [hole]), z0: z1, z1: z2 },
          { region: region(foot, [hole]), z0: z2, z1: z2 + footT },
        ],
        [{ up: region(base, [reversed(neck)]) }, { down: region(foot, [reversed(neck)]) }],
      );
      bounds = [Math.max(B, footW), Math.max(B, footL), z2 + footT];
      book.notes.push('Print base down; the foot ends up on top and slides into the shoe.');
    } else {
      const rod = p.mount === 'rod15' ? 15 : 19;
      const bore = book.hole('Rod clip bore', rod);
      const opening = book.hole('Rod clip opening', ROD_OPENING_RATIO * rod);
      const ro = bore / 2 + ROD_WALL_MM;
      const zc = footT + NECK_HEIGHT_MM + ro - 1;
      const profile = profileOf(
        [rect(-footW / 2, 0, footW / 2, footT), rect(-neckW / 2, footT, neckW / 2, footT + NECK_HEIGHT_MM), outerCircle(2 * ro, res, [0, zc])],
        [holeCircle(bore, res, [0, zc]), rect(-opening / 2, zc, opening / 2, zc + ro + 1)],
      );
      mesh = meshOf(extrudeAlongY(profile, -footL / 2, footL / 2));
      bounds = [Math.max(footW, 2 * ro), footL, zc + ro];
      book.notes.push(`Snaps onto a ${rod} mm rod through a ${formatMm(opening)} opening. Print foot down.`);
    }
    return {
      mesh,
      drawn: { parameters: { ...p, footWidthMm: roundMm(footW), footThicknessMm: roundMm(footT) }, sizes: book.sizes, notes: book.notes },
      warnings,
      // An accessory hangs on it.
      loadBearing: true,
      shells: 1,
      boundsMm: bounds,
    };
  },
};
