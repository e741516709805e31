// Parametric parts made to size: pure, deterministic functions shared by the browser (live preview
// in a worker) and the server (preview, files). Each generator validates its own parameters.
import type { Generator, GeneratorKind } from './types';
import { washer } from './washer';

export * from './types';
export { toStl, to3mf } from './files';
export { circleSides, RESOLUTIONS, type Resolution } from './params';
export { CLEARANCE_HOLE_MM, CLEARANCES, SCREWS, SCREW_LABELS, type Clearance, type Screw } from './fasteners';
export { washer, washerSchema } from './washer';

export const GENERATOR_KINDS = ['washer', 'gear-ring', 'rod-clamp', 'cable-clip', 'shoe-foot', 'fit-gauge'] as const satisfies readonly GeneratorKind[];

export const GENERATORS: Partial<Record<GeneratorKind, Generator>> = {
  washer: washer as unknown as Generator,
};

export function isGeneratorKind(value: string): value is GeneratorKind {
  return (GENERATOR_KINDS as readonly string[]).includes(value);
}
