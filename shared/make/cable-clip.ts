import { z } from 'zod';
import type { Generator } from './types';
import { choiceOf, formatMm, lengthMm, resolution, roundMm } from './params';
import { CLEARANCE_HOLE_MM } from './fasteners';
import { blockWithHoleAlongY, extrude, profileOf, glue, holeCircle, meshOf, outerCircle, rect, SizeBook, type Geom2 } from './solid';

/** Snap opening as a share of the cable diameter (the rule asked for: about 0.8 × the cable). */
export const CABLE_OPENING_RATIO = 0.8;
/** A rod needs less squeeze to snap over (our choice). */
export const ROD_OPENING_RATIO = 0.85;
/** Room round a cable in its ring (our choice). */
const CABLE_PLAY_MM = 0.3;
const SLAB_MM = 3;
const ROD_WALL_MM = 3;
const EAR_WALL_MM = 3.5;

export const cableClipSchema = z
  .object({
    cableMm: lengthMm('Cable diameter', 2, 20).default(7),
    secondCableMm: lengthMm('Second cable diameter', 0, 20).default(0),
    mount: choiceOf('Mounting', ['rod15', 'rod19', 'screw'] as const).default('rod15'),
    widthMm: lengthMm('Clip width', 6, 30).default(12),
    wallMm: lengthMm('Wall', 1.2, 4).default(1.6),
    resolution: resolution.default('default'),
  })
  .superRefine((p, ctx) => {
    if (p.secondCableMm > 0 && p.secondCableMm < 2) {
      ctx.addIssue({ code: 'custom', path: ['secondCableMm'], message: 'Second cable diameter: 0 for none, or at least 2 mm.' });
    }
    const hole = CLEARANCE_HOLE_MM['1/4-20'].normal;
    if (p.mount === 'screw' && p.widthMm < hole + 3) {
      ctx.addIssue({ code: 'custom', path: ['widthMm'], message: `Clip width must be at least ${formatMm(hole + 3)} to fit the 1/4-20 hole.` });
    }
  });

export type CableClipParams = z.output<typeof cableClipSchema>;

export const cableClip: Generator<typeof cableClipSchema> = {
  kind: 'cable-clip',
  title: 'Cable clip',
  summary: 'A snap clip for one or two cables, opening about 0.8 × each cable, that snaps onto a 15 or 19 mm rod or takes a 1/4-20 screw.',
  schema: cableClipSchema,
  defaults: { cableMm: 7, secondCableMm: 0, mount: 'rod15', widthMm: 12, wallMm: 1.6, resolution: 'default' },
  fields: [
    { key: 'cableMm', label: 'Cable diameter', kind: 'length', unit: 'mm', min: 2, max: 20, step: 0.1 },
    { key: 'secondCableMm', label: 'Second cable diameter', kind: 'length', unit: 'mm', min: 0, max: 20, step: 0.1, help: '0 for a single cable.' },
    {
      key: 'mount',
      label: 'Mounting',
      kind: 'choice',
      options: [
        { value: 'rod15', label: 'snaps on a 15 mm rod' },
        { value: 'rod19', label: 'snaps on a 19 mm rod' },
        { value: 'screw', label: '1/4-20 screw' },
      ],
    },
    { key: 'widthMm', label: 'Clip width', kind: 'length', unit: 'mm', min: 6, max: 30, step: 0.5 },
    { key: 'wallMm', label: 'Wall', kind: 'length', unit: 'mm', min: 1.2, max: 4, step: 0.1 },
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
    const p = cableClipSchema.parse(input);
    const book = new SizeBook(corrections);
    const res = p.resolution;
    const cables = [p.cableMm, ...(p.secondCableMm > 0 ? [p.secondCableMm] : [])];
    const solids: Geom2[] = [];
    const cuts: Geom2[] = [];
    let x = 0;
    let left = 0;
    let right = 0;
    let top = 0;
    cables.forEach((d, i) => {
      const bore = book.hole(cables.length > 1 ? `Cable ${i + 1} ring` : 'Cable ring', d + CABLE_PLAY_MM);
      const ro = bore / 2 + p.wallMm;
      if (i === 0) left = x - ro;
      else x += ro - p.wallMm;
      const cy = SLAB_MM + bore / 2;
      const opening = book.hole(cables.length > 1 ? `Cable ${i + 1} opening` : 'Cable opening', CABLE_OPENING_RATIO * d);
      solids.push(outerCircle(2 * ro, res, [x, cy]));
      cuts.push(holeCircle(bore, res, [x, cy]), rect(x - opening / 2, cy, x + opening / 2, cy + ro + 1));
      right = x + ro;
      top = Math.max(top, cy + ro);
      x += ro;
    });
    const slabRight = right + 1;
    solids.push(rect(left, 0, slabRight, SLAB_MM));
    let bottom = 0;
    let extraRight = 0;
    let rightMost = slabRight;
    if (p.mount === 'screw') {
      extraRight = CLEARANCE_HOLE_MM['1/4-20'].normal + 2 * EAR_WALL_MM;
    } else {
      const rod = p.mount === 'rod15' ? 15 : 19;
      const rodBore = book.hole('Rod ring', rod);
      const ro = rodBore / 2 + ROD_WALL_MM;
      const cx = (left + slabRight) / 2;
      const cy = -rodBore / 2;
      const opening = book.hole('Rod opening', ROD_OPENING_RATIO * rod);
      solids.push(outerCircle(2 * ro, res, [cx, cy]));
      cuts.push(holeCircle(rodBore, res, [cx, cy]), rect(cx - opening / 2, cy - ro - 1, cx + opening / 2, cy));
      bottom = cy - ro;
      left = Math.min(left, cx - ro);
      rightMost = Math.max(rightMost, cx + ro);
      book.notes.push(`Snaps onto a ${rod} mm rod through a ${formatMm(opening)} opening.`);
    }
    const profile = profileOf(solids, cuts);
    let mesh;
    if (p.mount === 'screw') {
      const hole = book.hole('1/4-20 hole', CLEARANCE_HOLE_MM['1/4-20'].normal);
      const ear = blockWithHoleAlongY(
        slabRight,
        slabRight + extraRight,
        0,
        SLAB_MM,
        0,
        p.widthMm,
        { diameterMm: hole, x: slabRight + extraRight / 2, z: p.widthMm / 2 },
        res,
      );
      mesh = meshOf(glue([extrude(profile, p.widthMm), ear], [{ axis: 0, at: slabRight }]));
      book.notes.push('The 1/4-20 hole runs through the tab beside the cables.');
    } else {
      mesh = meshOf(extrude(profile, p.widthMm));
    }
    book.notes.push(`Cable openings ${CABLE_OPENING_RATIO} × the cable; print lying on its side so the rings are round.`);
    return {
      mesh,
      drawn: { parameters: { ...p, cables: cables.map(roundMm) }, sizes: book.sizes, notes: book.notes },
      warnings: cables.some((d) => d < 3) ? ['Rings for cables under 3 mm are fragile; print with more walls.'] : [],
      // Guides cables only; it must not hold gear.
      loadBearing: false,
      shells: 1,
      boundsMm: [Math.max(rightMost, slabRight + extraRight) - left, top - bottom, p.widthMm],
    };
  },
};
