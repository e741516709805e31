// The cautions shown wherever a part carries load, goes overhead, rides on a vehicle or sits near heat.
// Printed parts are not certified rigging: these are the usual cautions of the trade (common practice).
import type { SafetyFlags } from './catalogue';
import { heatCheck, isMaterialId } from './materials';

export interface Caution {
  flag: keyof SafetyFlags | 'general';
  text: string;
}

export function hasSafetyFlag(flags: SafetyFlags): boolean {
  return flags.carriesLoad || flags.overhead || flags.vehicle || flags.heat;
}

/**
 * The heat caution: the dashboard-in-sun figure (Vanos et al. 2018, via shared/materials.ts) and,
 * when the part's materials are known, what each of them does at that temperature.
 */
function heatCaution(materials: readonly string[]): string {
  const known = [...new Set(materials)].filter(isMaterialId);
  if (!known.length) return 'Mind the material heat limits: a dashboard in sun reaches about 69 °C, above the softening point of PLA.';
  return `Mind the material heat limits. ${known.map((m) => heatCheck(m, 'vehicle-sun').message).join(' ')}`;
}

export function safetyCautions(flags: SafetyFlags, testedLoadKg: number | null = null, materials: readonly string[] = []): Caution[] {
  if (!hasSafetyFlag(flags)) return [];
  const cautions: Caution[] = [];
  if (flags.carriesLoad) {
    cautions.push({
      flag: 'carriesLoad',
      text:
        testedLoadKg != null
          ? `Do not exceed the tested load of ${testedLoadKg} kg, and allow for knocks and vibration on top of it.`
          : 'No tested load was given: treat it as unrated and keep anything heavy off it.',
    });
  }
  if (flags.overhead || flags.carriesLoad) {
    cautions.push({
      flag: 'overhead',
      text: 'Add a safety cable or other secondary retention that holds the load if the printed part lets go.',
    });
  }
  if (flags.vehicle) {
    cautions.push({
      flag: 'vehicle',
      text: 'On a vehicle, vibration and sun both work on the part: secure it twice and check it at every stop.',
    });
  }
  if (flags.heat || flags.vehicle) {
    cautions.push({ flag: 'heat', text: heatCaution(materials) });
  }
  cautions.push({
    flag: 'general',
    text: 'Printed parts are not certified rigging. The key grip, the rigging lead and local codes decide whether it is used.',
  });
  return cautions;
}
