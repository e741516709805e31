import type { z } from 'zod';

export type GeneratorKind = 'washer' | 'gear-ring' | 'rod-clamp' | 'cable-clip' | 'shoe-foot' | 'fit-gauge';

/** Triangles as flat xyz positions in millimetres (9 numbers a triangle), wound outward: what analyseTriangles reads. */
export interface GeneratedMesh {
  positions: Float32Array;
  triangles: number;
}

/** A printer calibration: millimetres added to every drawn hole diameter and to every drawn outer size. */
export interface Corrections {
  holeMm?: number;
  outerMm?: number;
}

/** One size as wanted and as drawn (drawn = nominal + correction). */
export interface DrawnSize {
  label: string;
  nominalMm: number;
  drawnMm: number;
}

export interface Drawn {
  /** The parameters after units and defaults, in millimetres. */
  parameters: Record<string, unknown>;
  /** Sizes the calibration (or the clearance tables) decided, nominal beside drawn. */
  sizes: DrawnSize[];
  /** Plain sentences: "bore drawn at 15.25 mm so it prints at 15.0 mm on your printer". */
  notes: string[];
}

export interface GeneratedPart {
  mesh: GeneratedMesh;
  drawn: Drawn;
  warnings: string[];
  /** The part may hold or carry gear in use; the UI shows the load cautions. No load rating is ever implied. */
  loadBearing: boolean;
  /** Separate pieces the mesh is meant to have (analysis `shells`). */
  shells: number;
  /** Outer bounds the part promises to stay within, in mm (x, y, z). */
  boundsMm: [number, number, number];
}

/** Form hints for one parameter; the zod schema is the rule, this only helps draw the form. */
export interface FieldHint {
  key: string;
  label: string;
  kind: 'length' | 'number' | 'choice' | 'boolean';
  /** For lengths: millimetres; the form may accept inches ("1/4 in") which the schema converts. */
  unit?: 'mm' | 'count' | '°';
  min?: number;
  max?: number;
  step?: number;
  options?: { value: string | number; label: string }[];
  help?: string;
}

export interface Generator<S extends z.ZodType = z.ZodType> {
  kind: GeneratorKind;
  title: string;
  summary: string;
  schema: S;
  defaults: z.input<S>;
  fields: FieldHint[];
  generate(params: z.input<S>, corrections?: Corrections): GeneratedPart;
}
