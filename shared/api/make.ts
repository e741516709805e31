// What the make endpoints answer (server/modules/make), for the client.
import type { Caution } from '../safety';
import type { BedFitResult } from '../estimate';
import type { HeatCheck, HeatExposure, MaterialId } from '../materials';
import type { MeshAnalysis } from '../mesh';
import type { EstimateResult } from './planning';
import type { DrawnSize, FieldHint } from '../make/types';

/** GET /api/make: one entry per maker. */
export interface MakerInfo {
  kind: string;
  title: string;
  summary: string;
  /** Hints for drawing the form; the schema is the rule. */
  fields: FieldHint[];
  /** The parameter schema as JSON Schema (draft 2020-12), units in each field's description. */
  schema: Record<string, unknown>;
  defaults: Record<string, unknown>;
}

export interface MakerList {
  items: MakerInfo[];
}

/** A printer's calibration for one material (POST/GET /api/printers/:id/calibrations). */
export interface CalibrationInfo {
  id: number;
  printerId: number;
  material: MaterialId;
  nominalMm: number;
  holeFitMm: number;
  /** Holes are drawn this much larger than wanted (negative: smaller). */
  holeCorrectionMm: number;
  outerFitMm: number | null;
  outerCorrectionMm: number | null;
  /** "Bores are drawn 0.25 mm larger, so a 15 mm bore prints at 15 mm." */
  note: string;
  updatedAt: string;
}

export interface CalibrationList {
  items: CalibrationInfo[];
}

/** POST /api/make/:kind/preview */
export interface MakePreview {
  kind: string;
  analysis: MeshAnalysis;
  /** For the chosen material and print settings (and the printer's power, when known). */
  estimate: Omit<EstimateResult, 'geometry'> | null;
  /** Every sentence a member should read before printing, worst first. */
  warnings: string[];
  checks: {
    bedFit: (BedFitResult & { printer: string }) | null;
    heat: (HeatCheck & { exposure: HeatExposure }) | null;
    /** The usual cautions when the part can carry load; never a rating. */
    cautions: Caution[];
  };
  /** The parameters after units and defaults, as the generator took them. */
  parameters: Record<string, unknown>;
  /** Sizes as wanted beside as drawn (after the clearance tables and the printer's corrections). */
  sizes: DrawnSize[];
  corrections: { holeMm: number; outerMm: number; printer: string; material: MaterialId } | null;
  /** "Bore drawn at 15.25 mm so it prints at 15 mm on your printer." */
  calibrationNotes: string[];
  /** What the maker chose and why (clearance tables, tooth counts, …). */
  notes: string[];
  loadBearing: boolean;
}

/** Shown on a part page made with a maker. */
export interface MadeWith {
  kind: string;
  title: string;
  params: Record<string, unknown>;
  /** "module 0.8, barrel 82 mm" */
  summary: string;
}
