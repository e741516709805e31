import { z } from 'zod';
import type { Corrections, Generator } from './types';
import { choiceOf, countOf, formatMm, lengthMm, resolution, roundMm } from './params';
import { circlePath, extrude, holePath, meshOf, region, reversed, stackLayers, type Vec2 } from './solid';

/** Notches that label each step (our choice): 0.8 mm wide, 1 mm deep, 1.6 mm apart; the nominal step gets one 2.4 mm notch. */
const NOTCH_WIDTH_MM = 0.8;
const NOTCH_DEPTH_MM = 1;
const NOTCH_PITCH_MM = 1.6;
const NOMINAL_NOTCH_MM = 2.4;
const EDGE_MARGIN_MM = 3;
/** Longest coupon we draw (our choice): it must fit a small bed and print in minutes. */
export const GAUGE_MAX_LENGTH_MM = 200;

function layout(p: { nominalMm: number; stepMm: number; stepsBelow: number; stepsAbove: number }) {
  const largest = p.nominalMm + p.stepsAbove * p.stepMm;
  const pitch = Math.max(largest + 3.5, Math.max(p.stepsAbove, p.stepsBelow) * NOTCH_PITCH_MM + 2, NOMINAL_NOTCH_MM + 2);
  const count = p.stepsBelow + p.stepsAbove + 1;
  return { largest, pitch, count, width: pitch * count };
}

export const fitGaugeSchema = z
  .object({
    mode: choiceOf('Gauge', ['bores', 'pegs'] as const).default('bores'),
    nominalMm: lengthMm('Key dimension', 3, 40).default(15),
    stepMm: lengthMm('Step', 0.05, 0.5).default(0.1),
    stepsBelow: countOf('Steps below', 0, 6).default(2),
    stepsAbove: countOf('Steps above', 0, 8).default(6),
    thicknessMm: lengthMm('Plate thickness', 2, 10).default(3),
    pegHeightMm: lengthMm('Peg height', 3, 15).default(5),
    resolution: resolution.default('default'),
  })
  .superRefine((p, ctx) => {
    if (p.stepsBelow + p.stepsAbove < 1)
      ctx.addIssue({ code: 'custom', path: ['stepsAbove'], message: 'A gauge needs at least two steps: add a step above or below.' });
    const { width, pitch } = layout(p);
    if (width > GAUGE_MAX_LENGTH_MM) {
      ctx.addIssue({
        code: 'custom',
        path: ['stepsAbove'],
        message: `The coupon would be ${formatMm(width)} long; use at most ${Math.floor(GAUGE_MAX_LENGTH_MM / pitch)} steps in all for this size.`,
      });
    }
    if (p.nominalMm - p.stepsBelow * p.stepMm < 2) {
      ctx.addIssue({
        code: 'custom',
        path: ['stepsBelow'],
        message: `The smallest step would be under 2 mm; use at most ${Math.floor((p.nominalMm - 2) / p.stepMm)} steps below.`,
      });
    }
  });

export type FitGaugeParams = z.output<typeof fitGaugeSchema>;

export interface GaugeStep {
  index: number;
  /** Steps from the nominal size: negative below, positive above. */
  offset: number;
  diameterMm: number;
  /** How the step is marked on the coupon. */
  mark: string;
}

export function gaugeSteps(input: z.input<typeof fitGaugeSchema>): GaugeStep[] {
  const p = fitGaugeSchema.parse(input);
  const steps: GaugeStep[] = [];
  for (let k = -p.stepsBelow; k <= p.stepsAbove; k++) {
    steps.push({
      index: k + p.stepsBelow,
      offset: k,
      diameterMm: roundMm(p.nominalMm + k * p.stepMm),
      mark:
        k === 0
          ? 'one wide notch on the front edge'
          : k > 0
            ? `${k} notch${k > 1 ? 'es' : ''} on the front edge`
            : `${-k} notch${k < -1 ? 'es' : ''} on the back edge`,
    });
  }
  return steps;
}

/**
 * The correction a fitting step records. Bores: the bore that slides snugly over a pin of the key
 * dimension was drawn d, so holes print (d − nominal) small: add that to every hole. Pegs: the peg
 * that slides snugly into a hole of the key dimension was drawn d: add (d − nominal) to outer sizes.
 */
export function correctionFromGauge(input: z.input<typeof fitGaugeSchema>, fittingIndex: number): Corrections {
  const p = fitGaugeSchema.parse(input);
  const step = gaugeSteps(p).find((s) => s.index === fittingIndex);
  if (!step) throw new RangeError(`Step ${fittingIndex} is not on this gauge (0 to ${p.stepsBelow + p.stepsAbove}).`);
  const delta = roundMm(step.diameterMm - p.nominalMm);
  return p.mode === 'bores' ? { holeMm: delta } : { outerMm: delta };
}

/**
 * Each step's circle is turned by a different fraction of a side: with sizes stepping evenly, the
 * corners of unturned circles would line up across the row, and triangulating between corners in a
 * line makes facets of no area.
 */
const phaseOf = (i: number) => (i * 0.618034) % 1;

function notchedEdge(centres: { x: number; offset: number }[], width: number, height: number): Vec2[] {
  const front: [number, number][] = [];
  const back: [number, number][] = [];
  for (const { x, offset } of centres) {
    if (offset === 0) front.push([x - NOMINAL_NOTCH_MM / 2, x + NOMINAL_NOTCH_MM / 2]);
    const count = Math.abs(offset);
    for (let j = 0; j < count; j++) {
      const a = x - ((count - 1) * NOTCH_PITCH_MM) / 2 + j * NOTCH_PITCH_MM - NOTCH_WIDTH_MM / 2;
      (offset > 0 ? front : back).push([a, a + NOTCH_WIDTH_MM]);
    }
  }
  const pts: Vec2[] = [[0, 0]];
  for (const [a, b] of front) pts.push([a, 0], [a, NOTCH_DEPTH_MM], [b, NOTCH_DEPTH_MM], [b, 0]);
  pts.push([width, 0], [width, height]);
  for (const [a, b] of [...back].sort((u, v) => v[0] - u[0])) pts.push([b, height], [b, height - NOTCH_DEPTH_MM], [a, height - NOTCH_DEPTH_MM], [a, height]);
  pts.push([0, height]);
  return pts;
}

export const fitGauge: Generator<typeof fitGaugeSchema> = {
  kind: 'fit-gauge',
  title: 'Fit-test gauge',
  summary:
    'A small coupon of stepped bores (or pegs) round one key dimension, each step marked by notches, to find how much your printer needs added to holes or outer sizes.',
  schema: fitGaugeSchema,
  defaults: { mode: 'bores', nominalMm: 15, stepMm: 0.1, stepsBelow: 2, stepsAbove: 6, thicknessMm: 3, pegHeightMm: 5, resolution: 'default' },
  fields: [
    {
      key: 'mode',
      label: 'Gauge',
      kind: 'choice',
      options: [
        { value: 'bores', label: 'bores (hole correction)' },
        { value: 'pegs', label: 'pegs (outer-size correction)' },
      ],
    },
    { key: 'nominalMm', label: 'Key dimension', kind: 'length', unit: 'mm', min: 3, max: 40, step: 0.1, help: 'For example 15 for a 15 mm rod.' },
    { key: 'stepMm', label: 'Step', kind: 'length', unit: 'mm', min: 0.05, max: 0.5, step: 0.05 },
    { key: 'stepsBelow', label: 'Steps below', kind: 'number', unit: 'count', min: 0, max: 6, step: 1 },
    { key: 'stepsAbove', label: 'Steps above', kind: 'number', unit: 'count', min: 0, max: 8, step: 1 },
    { key: 'thicknessMm', label: 'Plate thickness', kind: 'length', unit: 'mm', min: 2, max: 10, step: 0.5 },
    { key: 'pegHeightMm', label: 'Peg height', kind: 'length', unit: 'mm', min: 3, max: 15, step: 0.5 },
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
    const p = fitGaugeSchema.parse(input);
    const steps = gaugeSteps(p);
    const largest = steps[steps.length - 1].diameterMm;
    const { pitch, width } = layout(p);
    const height = largest + 2 * EDGE_MARGIN_MM + 2 * NOTCH_DEPTH_MM;
    const centres = steps.map((s, i) => ({ x: pitch * (i + 0.5), offset: s.offset, d: s.diameterMm }));
    const outline = notchedEdge(centres, width, height);
    const notes = [
      `Steps from ${formatMm(steps[0].diameterMm)} to ${formatMm(largest)} in ${formatMm(p.stepMm)}: the nominal ${formatMm(p.nominalMm)} has one wide notch on the front edge, each step above one more narrow notch on the front edge, each step below one more on the back edge.`,
      p.mode === 'bores'
        ? 'Find the bore that slides snugly over a pin or rod of the key dimension; record that step.'
        : 'Find the peg that slides snugly into a hole of the key dimension; record that step.',
    ];
    if (corrections && (corrections.holeMm || corrections.outerMm)) notes.push('The gauge is drawn without any printer correction: it is what measures one.');
    let mesh;
    let top = p.thicknessMm;
    if (p.mode === 'bores') {
      mesh = meshOf(
        extrude(
          region(
            outline,
            centres.map((c, i) => holePath(c.d, p.resolution, [c.x, height / 2], phaseOf(i))),
          ),
          p.thicknessMm,
        ),
      );
    } else {
      const pegs = centres.map((c, i) => circlePath(c.d, p.resolution, [c.x, height / 2], phaseOf(i)));
      top = p.thicknessMm + p.pegHeightMm;
      mesh = stackLayers(
        [
          { region: region(outline), z0: 0, z1: p.thicknessMm },
          { region: region(pegs[0], pegs.slice(1)), z0: p.thicknessMm, z1: top },
        ],
        [{ up: region(outline, pegs.map(reversed)) }],
      );
    }
    return {
      mesh,
      drawn: {
        parameters: { ...p, steps },
        sizes: steps.map((s) => ({ label: `Step ${s.index} (${s.mark})`, nominalMm: s.diameterMm, drawnMm: s.diameterMm })),
        notes,
      },
      warnings: [],
      loadBearing: false,
      shells: 1,
      boundsMm: [width, height, top],
    };
  },
};
