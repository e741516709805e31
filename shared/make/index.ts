// Parametric parts made to size: pure, deterministic functions shared by the browser (live preview
// in a worker) and the server (preview, files). Each generator validates its own parameters.
import type { Generator, GeneratorKind } from './types';
import { washer } from './washer';
import { gearRing } from './gear-ring';
import { rodClamp } from './rod-clamp';
import { cableClip } from './cable-clip';
import { shoeFoot } from './shoe-foot';
import { fitGauge } from './fit-gauge';

export * from './types';
export { toStl, to3mf } from './files';
export { circleSides, correctionsSchema, RESOLUTIONS, type Resolution } from './params';
export { CLEARANCE_HOLE_MM, CLEARANCES, SCREWS, SCREW_LABELS, type Clearance, type Screw } from './fasteners';
export { washer, washerSchema } from './washer';
export { rodClamp, rodClampSchema, ROD_CENTRES } from './rod-clamp';
export { cableClip, cableClipSchema, CABLE_OPENING_RATIO } from './cable-clip';
export { shoeFoot, shoeFootSchema, SHOE } from './shoe-foot';
export { fitGauge, fitGaugeSchema, gaugeSteps, correctionFromGauge, type GaugeStep } from './fit-gauge';
export { gearRing, gearRingSchema, gearDiameters, toothCountFor, MODULES } from './gear-ring';

export const GENERATOR_KINDS = ['washer', 'gear-ring', 'rod-clamp', 'cable-clip', 'shoe-foot', 'fit-gauge'] as const satisfies readonly GeneratorKind[];

export const GENERATORS: Record<GeneratorKind, Generator> = {
  washer: washer as unknown as Generator,
  'gear-ring': gearRing as unknown as Generator,
  'rod-clamp': rodClamp as unknown as Generator,
  'cable-clip': cableClip as unknown as Generator,
  'shoe-foot': shoeFoot as unknown as Generator,
  'fit-gauge': fitGauge as unknown as Generator,
};

export function isGeneratorKind(value: string): value is GeneratorKind {
  return (GENERATOR_KINDS as readonly string[]).includes(value);
}
