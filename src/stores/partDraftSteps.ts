// The submit flow's steps and what each one checks before the contributor moves on: the shared zod
// schemas per step, the files, the adaptation's licence, the adaptation's own safety statement and
// the typed lengths. Pure functions of the draft's values; the store keeps the messages.
// The schemas (and zod, 26 kB gzip) are fetched at the contributor's first edit or first step left,
// not with the page: loadPartSchemas() before a check, which then runs synchronously.
import type { z } from 'zod';
import { checkAdaptationLicence, isLicenceId, type LicenceId } from '@shared/licences';
import { parseLength } from '@shared/units';
import { fieldErrors } from '@shared/field-errors';
import type { KeyDimensionRow } from './partDraftFields';

type PartSchemas = typeof import('@shared/schemas/part');
let schemas: PartSchemas | null = null;
let loading: Promise<PartSchemas> | null = null;

/** Fetches the part schemas once; every check waits for this first. */
export function loadPartSchemas(): Promise<PartSchemas> {
  loading ??= import('@shared/schemas/part').then((m) => (schemas = m));
  loading.catch(() => (loading = null));
  return loading;
}

export const partSchemasLoaded = () => schemas !== null;

/** The part schemas, once loadPartSchemas() has resolved. */
export function partSchemas(): PartSchemas {
  if (!schemas) throw new Error('The part schemas are not loaded yet: await loadPartSchemas() before checking.');
  return schemas;
}

export const STEPS = [
  { key: 'details', label: 'What it is', short: 'About' },
  { key: 'files', label: 'Files and photos', short: 'Files' },
  { key: 'fit', label: 'What it fits', short: 'Fit' },
  { key: 'recipes', label: 'Print recipes', short: 'Recipes' },
  { key: 'licence', label: 'Licence and safety', short: 'Licence' },
  { key: 'review', label: 'Check and send', short: 'Send' },
] as const;
export type StepKey = (typeof STEPS)[number]['key'];

/** Which step shows a field, by the first segment of its key ("recipes.0.layerMm" → recipes). */
const STEP_FIELDS: Record<StepKey, readonly string[]> = {
  details: ['title', 'summary', 'description', 'category'],
  files: ['model', 'photo', 'source', 'drawnInInches'],
  fit: ['bodies', 'mounts', 'keyDimensions'],
  recipes: ['recipes'],
  licence: ['licence', 'safety', 'testedLoadKg', 'parentId', 'visibility'],
  review: [],
};

export function stepOfField(key: string): StepKey {
  const head = key.split('.')[0];
  return STEPS.find((s) => STEP_FIELDS[s.key].includes(head))?.key ?? 'review';
}

const LENGTH_HINT = 'Write a length such as 15, 15 mm or 5/8 in.';

const PICKS = {
  details: { title: true, summary: true, description: true, category: true },
  fit: { bodies: true, mounts: true, keyDimensions: true },
  recipes: { recipes: true },
  licence: { licence: true, safety: true, testedLoadKg: true },
} as const;

/** What the checks read from the draft. */
export interface StepInputs {
  mode: 'new' | 'adapt' | 'edit';
  /** Everything but the files, as the schemas expect it (not yet validated). */
  fields: Record<string, unknown>;
  /** The whole submission (fields, parent, make); new parts and adaptations. */
  submission: Record<string, unknown>;
  keyDimensions: KeyDimensionRow[];
  licence: LicenceId | null;
  /** Adapting: the licence of the part adapted from. */
  parentLicenceId: string | null;
  safetyStated: boolean;
  /** The files step's messages (the files composable knows them). */
  fileIssues: () => Record<string, string>;
}

function schemaIssues<S extends z.ZodType>(schema: S, value: unknown): Record<string, string> {
  const result = schema.safeParse(value);
  return result.success ? {} : fieldErrors(result.error);
}

function licenceIssues(d: StepInputs): Record<string, string> {
  if (!d.parentLicenceId || !d.licence || !isLicenceId(d.parentLicenceId)) return {};
  const check = checkAdaptationLicence(d.parentLicenceId, d.licence);
  return check.ok ? {} : { licence: check.reason };
}

function safetyIssues(d: StepInputs): Record<string, string> {
  if (d.mode !== 'adapt' || d.safetyStated) return {};
  return { safety: 'Say where your adaptation is used: tick what applies (or nothing) and confirm it below. Nothing is copied from the original.' };
}

function dimensionIssues(d: StepInputs): Record<string, string> {
  const out: Record<string, string> = {};
  d.keyDimensions.forEach((row, i) => {
    if (row.value.trim() && parseLength(row.value) === null) out[`keyDimensions.${i}.valueMm`] = LENGTH_HINT;
    if (row.tol.trim() && parseLength(row.tol) === null) out[`keyDimensions.${i}.tolMm`] = LENGTH_HINT;
  });
  return out;
}

/** The messages of one step, keyed by field; the review step checks every step and the whole payload. */
export function issuesOf(step: StepKey, d: StepInputs): Record<string, string> {
  switch (step) {
    case 'details':
      return schemaIssues(partSchemas().partSubmissionSchema.pick(PICKS.details), d.fields);
    case 'files':
      return d.fileIssues();
    case 'fit':
      return { ...schemaIssues(partSchemas().partSubmissionSchema.pick(PICKS.fit), d.fields), ...dimensionIssues(d) };
    case 'recipes':
      return schemaIssues(partSchemas().partSubmissionSchema.pick(PICKS.recipes), d.fields);
    case 'licence':
      return { ...schemaIssues(partSchemas().partSubmissionSchema.pick(PICKS.licence), d.fields), ...licenceIssues(d), ...safetyIssues(d) };
    case 'review': {
      const whole = d.mode === 'edit' ? schemaIssues(partSchemas().partUpdateSchema, d.fields) : schemaIssues(partSchemas().partSubmissionSchema, d.submission);
      const all: Record<string, string> = { ...whole };
      for (const s of STEPS) if (s.key !== 'review') Object.assign(all, issuesOf(s.key, d));
      return all;
    }
  }
}
