// What the make module says about makers and made parts without generating anything: a maker by
// name, its parameters checked, its JSON schema, a printer calibration in words, and a made part's
// name and summary (planning and parts use these too, so they live apart from the service).
import { z } from 'zod';
import type { CalibrationInfo, MadeWith } from '@shared/api/make';
import { GENERATORS, type Generator } from '@shared/make';
import { fieldErrors } from '@shared/validation';
import type { PrinterCalibration } from '../../db/models';
import { AppError } from '../../errors';

export const makers = GENERATORS as Record<string, Generator>;

export function generatorOf(kind: string): Generator {
  if (!Object.hasOwn(makers, kind)) {
    throw AppError.notFound(`There is no maker called "${kind}". The makers are: ${Object.keys(makers).join(', ')}.`);
  }
  return makers[kind];
}

/** The generator's own schema; messages come back per field as params.<name>. */
export function parseParams(kind: string, raw: unknown): Record<string, unknown> {
  const result = (generatorOf(kind).schema as z.ZodType).safeParse(raw ?? {});
  if (!result.success) {
    const fields = Object.fromEntries(Object.entries(fieldErrors(result.error)).map(([k, v]) => [k === '_' ? 'params' : `params.${k}`, v]));
    const first = Object.values(fields)[0];
    throw AppError.fields(Object.keys(fields).length === 1 ? first : 'Some sizes need another look.', fields);
  }
  return result.data as Record<string, unknown>;
}

export function jsonSchemaOf(schema: unknown): Record<string, unknown> {
  try {
    return z.toJSONSchema(schema as z.ZodType, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  } catch {
    return {};
  }
}

export const round = (v: number, places = 2) => Math.round(v * 10 ** places) / 10 ** places;
const mm = (v: number) => `${round(v, 2)} mm`;

export function calibrationNote(c: Pick<PrinterCalibration, 'nominalMm' | 'holeCorrectionMm' | 'outerCorrectionMm'>): string {
  const hole =
    Math.abs(c.holeCorrectionMm) < 0.005
      ? `Bores print true in this material: a ${mm(c.nominalMm)} bore is drawn at ${mm(c.nominalMm)}.`
      : `Bores are drawn ${mm(Math.abs(c.holeCorrectionMm))} ${c.holeCorrectionMm > 0 ? 'larger' : 'smaller'}: a ${mm(c.nominalMm)} bore is drawn at ${mm(c.nominalMm + c.holeCorrectionMm)}.`;
  if (c.outerCorrectionMm == null || Math.abs(c.outerCorrectionMm) < 0.005) return hole;
  return `${hole} Outside sizes are drawn ${mm(Math.abs(c.outerCorrectionMm))} ${c.outerCorrectionMm > 0 ? 'larger' : 'smaller'}.`;
}

export function presentCalibration(c: PrinterCalibration): CalibrationInfo {
  return {
    id: c.id,
    printerId: c.printerId,
    material: c.material,
    nominalMm: c.nominalMm,
    holeFitMm: c.holeFitMm,
    holeCorrectionMm: c.holeCorrectionMm,
    outerFitMm: c.outerFitMm,
    outerCorrectionMm: c.outerCorrectionMm,
    note: calibrationNote(c),
    updatedAt: c.updatedAt.toISOString(),
  };
}

/** A label without its bracketed aside: "Barrel diameter (measured)" → "Barrel diameter". */
const plain = (text: string) => text.replace(/\s*\([^)]*\)/g, '').trim();

/** A made part's name from its maker and main sizes: "Lens gear ring, module 0.8, barrel 82 mm". */
export function madeSummary(kind: string, params: Record<string, unknown>, count = 3): string {
  const g = makers[kind];
  if (!g) return kind;
  const parts: string[] = [];
  for (const f of g.fields) {
    if (parts.length >= count || f.key === 'resolution') continue;
    const v = params[f.key];
    if (v === undefined || v === null || v === '' || typeof v === 'boolean') continue;
    const label = plain(f.label).toLowerCase();
    const option = f.options?.find((o) => o.value === v)?.label;
    if (option) parts.push(`${label} ${plain(option)}`);
    else if (typeof v === 'number') parts.push(`${label} ${round(v, 3)}${f.kind === 'length' ? ' mm' : f.unit === '°' ? '°' : ''}`);
    else parts.push(`${label} ${String(v)}`);
  }
  return parts.join(', ');
}

/** "made to size with Rigshelf's gear-ring maker: module 0.8, barrel 82 mm" */
export function madeWith(kind: string, params: Record<string, unknown>): MadeWith {
  const g = makers[kind];
  return { kind, title: g?.title ?? kind, params, summary: madeSummary(kind, params) };
}

export function madeTitle(kind: string, params: Record<string, unknown>): string {
  const g = makers[kind];
  const sizes = madeSummary(kind, params);
  return g ? (sizes ? `${g.title}, ${sizes}` : g.title) : kind;
}
