// The shapes of the submit form's fields (recipes, key dimensions, safety) and how they become the
// payload the schemas read. Pure: shared by the part-draft store, its files and its step checks.
import type { SafetyFlags } from '@shared/catalogue';
import type { RecipeInput } from '@shared/schemas/recipe';
import { parseLength } from '@shared/units';

export interface KeyDimensionRow {
  uid: string;
  name: string;
  /** As typed: "15", "15 mm", "5/8 in". */
  value: string;
  tol: string;
}

export interface RecipeForm {
  uid: string;
  purpose: RecipeInput['purpose'];
  material: RecipeInput['material'];
  nozzleMm: number | null;
  layerMm: number | null;
  walls: number | null;
  topBottomLayers: number | null;
  infillPct: number | null;
  infillPattern: RecipeInput['infillPattern'];
  hotendC: number | null;
  bedC: number | null;
  speedMmS: number | null;
  supports: RecipeInput['supports'];
  orientationNote: string;
  printerBedMm: [number | null, number | null, number | null];
  resultNotes: string;
}

let uidCounter = 0;
/** A key for v-for rows that have no id yet. */
export const uid = () => `d${++uidCounter}`;

export function blankRecipe(purpose: RecipeInput['purpose'] = 'set-ready'): RecipeForm {
  return {
    uid: uid(),
    purpose,
    material: 'PLA',
    nozzleMm: 0.4,
    layerMm: 0.2,
    walls: 3,
    topBottomLayers: 4,
    infillPct: null,
    infillPattern: 'gyroid',
    hotendC: null,
    bedC: null,
    speedMmS: null,
    supports: 'none',
    orientationNote: '',
    printerBedMm: [null, null, null],
    resultNotes: '',
  };
}

export function recipeFormOf(r: RecipeInput): RecipeForm {
  return {
    ...blankRecipe(r.purpose),
    ...r,
    orientationNote: r.orientationNote ?? '',
    resultNotes: r.resultNotes ?? '',
    printerBedMm: r.printerBedMm ? [...r.printerBedMm] : [null, null, null],
  };
}

/** A recipe as the schema reads it: empty notes and an empty bed left out. */
export function recipeInput(r: RecipeForm) {
  const bed = r.printerBedMm.some((v) => v !== null) ? r.printerBedMm : undefined;
  return {
    purpose: r.purpose,
    material: r.material,
    nozzleMm: r.nozzleMm,
    layerMm: r.layerMm,
    walls: r.walls,
    topBottomLayers: r.topBottomLayers,
    infillPct: r.infillPct,
    infillPattern: r.infillPattern,
    hotendC: r.hotendC,
    bedC: r.bedC,
    speedMmS: r.speedMmS,
    supports: r.supports,
    orientationNote: r.orientationNote.trim() || undefined,
    printerBedMm: bed,
    resultNotes: r.resultNotes.trim() || undefined,
  };
}

export function blankSafety(): SafetyFlags {
  return { carriesLoad: false, overhead: false, vehicle: false, heat: false };
}

/** A typed length in mm; NaN when it is not one (so the schema reports it), undefined when empty. */
export function lengthOf(text: string): number | undefined {
  if (!text.trim()) return undefined;
  return parseLength(text) ?? Number.NaN;
}
