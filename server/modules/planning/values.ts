// Small rules the planning files share about input values and model files.
import { meshConcerns, type MeshSoundness } from '@shared/mesh/concerns';

/** Empty text means "none". */
export function textOrNull(value: string | null | undefined): string | null {
  return value === undefined || value === null || value === '' ? null : value;
}

/** Only the keys that were sent: an update changes what it names. */
export function defined<T extends object>(values: T): Partial<T> {
  return Object.fromEntries(Object.entries(values).filter(([, v]) => v !== undefined)) as Partial<T>;
}

/** What a crew should know about a model before trusting an estimate made from it. */
export function soundnessNotes(name: string, a: MeshSoundness): string[] {
  const concerns = meshConcerns(a);
  if (!concerns.length) return [];
  const trust = a.watertight ? 'check the model before printing' : 'its volume and this estimate may be off';
  return [`${name}: ${concerns.join('; ')}, so ${trust}.`];
}
