// The open licences a part may carry, and which licence an adaptation of a part may use.
//
// Names and URLs are copied from the SPDX License List (npm `spdx-license-list`); a unit test
// checks they still match, so the client bundle does not need the whole list.
//
// Adaptation rules follow the licence texts:
// - CC 4.0 legal code: ND §2(a)(1)(B) allows producing but not sharing adapted material;
//   BY §3(a)(4) lets the adapter choose any licence that does not stop recipients complying
//   with the original's; SA §3(b)(1) requires the same licence elements (this version or
//   later) or a licence CC lists as compatible (GPL v3, announced 8 Oct 2015); NC §2(a)(1)(B)
//   allows adapted material for non-commercial purposes only.
// - GPL v3 §5(c), CERN-OHL-S v2 §3.3(d), CERN-OHL-W v2 §3.3(d) and §8.3 (a W design may be
//   treated as S), CERN-OHL-P v2 §3.3–3.4 and the MIT notice clause.
// Choices where the texts leave room (see the tests for the full matrix):
// - A No-Derivatives licence on an adaptation is accepted where the parent allows the adapter
//   to choose (BY, BY-NC, CC0, MIT, CERN-OHL-P): it limits the next adapter, not compliance.
// - CC0 is refused for any parent that requires credit or notices: the adapter cannot waive
//   the original author's rights, and CC0 would tell people no credit is needed.

export const LICENCE_IDS = [
  'CC-BY-4.0',
  'CC-BY-SA-4.0',
  'CC-BY-NC-4.0',
  'CC-BY-NC-SA-4.0',
  'CC-BY-ND-4.0',
  'CC-BY-NC-ND-4.0',
  'CC0-1.0',
  'CERN-OHL-P-2.0',
  'CERN-OHL-W-2.0',
  'CERN-OHL-S-2.0',
  'GPL-3.0-or-later',
  'MIT',
] as const;
export type LicenceId = (typeof LICENCE_IDS)[number];

/** How an adaptation's licence is constrained by the parent's. */
export type AdaptationPolicy = { kind: 'not-shareable' } | { kind: 'only'; childIds: readonly LicenceId[] } | { kind: 'keep-conditions' } | { kind: 'any' };

export interface LicenceInfo {
  id: LicenceId;
  /** Full name as on the SPDX License List. */
  name: string;
  /** Short form the licence steward uses, for labels and sentences. */
  shortName: string;
  /** Licence text URL as on the SPDX License List. */
  url: string;
  /** Credit to the author, or the original notices, must be kept. */
  attributionRequired: boolean;
  /** Adaptations must be shared under the same (or a listed compatible) licence. */
  shareAlike: boolean;
  nonCommercial: boolean;
  noDerivatives: boolean;
  /** What a person sharing an adaptation must do to honour the original. */
  creditDuty: string;
  adaptation: AdaptationPolicy;
}

const CC_CREDIT = 'Credit the original author and link to the original part.';
const NOTICES_CREDIT = 'Keep the original notices and say what you changed.';

const LICENCES: Record<LicenceId, LicenceInfo> = {
  'CC-BY-4.0': {
    id: 'CC-BY-4.0',
    name: 'Creative Commons Attribution 4.0 International',
    shortName: 'CC BY 4.0',
    url: 'https://creativecommons.org/licenses/by/4.0/legalcode',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'keep-conditions' },
  },
  'CC-BY-SA-4.0': {
    id: 'CC-BY-SA-4.0',
    name: 'Creative Commons Attribution Share Alike 4.0 International',
    shortName: 'CC BY-SA 4.0',
    url: 'https://creativecommons.org/licenses/by-sa/4.0/legalcode',
    attributionRequired: true,
    shareAlike: true,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'only', childIds: ['CC-BY-SA-4.0', 'GPL-3.0-or-later'] },
  },
  'CC-BY-NC-4.0': {
    id: 'CC-BY-NC-4.0',
    name: 'Creative Commons Attribution Non Commercial 4.0 International',
    shortName: 'CC BY-NC 4.0',
    url: 'https://creativecommons.org/licenses/by-nc/4.0/legalcode',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: true,
    noDerivatives: false,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'keep-conditions' },
  },
  'CC-BY-NC-SA-4.0': {
    id: 'CC-BY-NC-SA-4.0',
    name: 'Creative Commons Attribution Non Commercial Share Alike 4.0 International',
    shortName: 'CC BY-NC-SA 4.0',
    url: 'https://creativecommons.org/licenses/by-nc-sa/4.0/legalcode',
    attributionRequired: true,
    shareAlike: true,
    nonCommercial: true,
    noDerivatives: false,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'only', childIds: ['CC-BY-NC-SA-4.0'] },
  },
  'CC-BY-ND-4.0': {
    id: 'CC-BY-ND-4.0',
    name: 'Creative Commons Attribution No Derivatives 4.0 International',
    shortName: 'CC BY-ND 4.0',
    url: 'https://creativecommons.org/licenses/by-nd/4.0/legalcode',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: false,
    noDerivatives: true,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'not-shareable' },
  },
  'CC-BY-NC-ND-4.0': {
    id: 'CC-BY-NC-ND-4.0',
    name: 'Creative Commons Attribution Non Commercial No Derivatives 4.0 International',
    shortName: 'CC BY-NC-ND 4.0',
    url: 'https://creativecommons.org/licenses/by-nc-nd/4.0/legalcode',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: true,
    noDerivatives: true,
    creditDuty: CC_CREDIT,
    adaptation: { kind: 'not-shareable' },
  },
  'CC0-1.0': {
    id: 'CC0-1.0',
    name: 'Creative Commons Zero v1.0 Universal',
    shortName: 'CC0 1.0',
    url: 'https://creativecommons.org/publicdomain/zero/1.0/legalcode',
    attributionRequired: false,
    shareAlike: false,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: 'Credit to the original author is welcome but not required.',
    adaptation: { kind: 'any' },
  },
  'CERN-OHL-P-2.0': {
    id: 'CERN-OHL-P-2.0',
    name: 'CERN Open Hardware Licence Version 2 - Permissive',
    shortName: 'CERN-OHL-P v2',
    url: 'https://www.ohwr.org/project/cernohl/wikis/Documents/CERN-OHL-version-2',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: NOTICES_CREDIT,
    adaptation: { kind: 'keep-conditions' },
  },
  'CERN-OHL-W-2.0': {
    id: 'CERN-OHL-W-2.0',
    name: 'CERN Open Hardware Licence Version 2 - Weakly Reciprocal',
    shortName: 'CERN-OHL-W v2',
    url: 'https://www.ohwr.org/project/cernohl/wikis/Documents/CERN-OHL-version-2',
    attributionRequired: true,
    shareAlike: true,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: NOTICES_CREDIT,
    adaptation: { kind: 'only', childIds: ['CERN-OHL-W-2.0', 'CERN-OHL-S-2.0'] },
  },
  'CERN-OHL-S-2.0': {
    id: 'CERN-OHL-S-2.0',
    name: 'CERN Open Hardware Licence Version 2 - Strongly Reciprocal',
    shortName: 'CERN-OHL-S v2',
    url: 'https://www.ohwr.org/project/cernohl/wikis/Documents/CERN-OHL-version-2',
    attributionRequired: true,
    shareAlike: true,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: NOTICES_CREDIT,
    adaptation: { kind: 'only', childIds: ['CERN-OHL-S-2.0'] },
  },
  'GPL-3.0-or-later': {
    id: 'GPL-3.0-or-later',
    name: 'GNU General Public License v3.0 or later',
    shortName: 'GPL v3 or later',
    url: 'https://www.gnu.org/licenses/gpl-3.0-standalone.html',
    attributionRequired: true,
    shareAlike: true,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: NOTICES_CREDIT,
    adaptation: { kind: 'only', childIds: ['GPL-3.0-or-later'] },
  },
  MIT: {
    id: 'MIT',
    name: 'MIT License',
    shortName: 'MIT',
    url: 'https://opensource.org/license/mit/',
    attributionRequired: true,
    shareAlike: false,
    nonCommercial: false,
    noDerivatives: false,
    creditDuty: 'Keep the original copyright and permission notice.',
    adaptation: { kind: 'keep-conditions' },
  },
};

export function isLicenceId(value: unknown): value is LicenceId {
  return typeof value === 'string' && (LICENCE_IDS as readonly string[]).includes(value);
}

export function licenceInfo(id: LicenceId): LicenceInfo {
  const info = LICENCES[id];
  if (!info) throw new RangeError(`Unknown licence: ${String(id)}`);
  return info;
}

export interface AdaptationRule {
  /** Whether an adaptation may be shared at all. */
  allowed: boolean;
  allowedChildIds: LicenceId[];
  mustKeepNonCommercial: boolean;
  attributionRequired: boolean;
  reason: string;
}

function keepsConditions(parent: LicenceInfo, child: LicenceInfo): boolean {
  if (parent.attributionRequired && !child.attributionRequired) return false;
  return !parent.nonCommercial || child.nonCommercial;
}

function allowedChildren(parent: LicenceInfo): LicenceId[] {
  const policy = parent.adaptation;
  switch (policy.kind) {
    case 'not-shareable':
      return [];
    case 'only':
      return [...policy.childIds];
    case 'keep-conditions':
      return LICENCE_IDS.filter((id) => keepsConditions(parent, LICENCES[id]));
    case 'any':
      return [...LICENCE_IDS];
  }
}

function listNames(ids: readonly LicenceId[]): string {
  const names = ids.map((id) => LICENCES[id].shortName);
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} or ${names.at(-1)}`;
}

function ruleReason(parent: LicenceInfo, childIds: readonly LicenceId[]): string {
  const name = parent.shortName;
  switch (parent.id) {
    case 'CC-BY-ND-4.0':
    case 'CC-BY-NC-ND-4.0':
      return `${name} lets people share the part only unchanged, so an adaptation of it cannot be shared. Ask the author for permission, or design your own part.`;
    case 'CC-BY-SA-4.0':
      return `${name} is share-alike: an adaptation must be shared under ${name}, or under GPL v3 or later, which Creative Commons lists as compatible. ${parent.creditDuty}`;
    case 'CC-BY-NC-SA-4.0':
      return `${name} is share-alike and non-commercial: an adaptation must be shared under ${name}. ${parent.creditDuty}`;
    case 'CC-BY-NC-4.0':
      return `${name} allows adaptations for non-commercial use only, so the adaptation's licence must also be non-commercial: ${listNames(childIds)}. ${parent.creditDuty}`;
    case 'CC0-1.0':
      return `${name} puts the part in the public domain: an adaptation may use any licence. ${parent.creditDuty}`;
    case 'GPL-3.0-or-later':
      return `${name} is copyleft: an adaptation must be shared under ${name}. ${parent.creditDuty}`;
    case 'CERN-OHL-S-2.0':
      return `${name} is strongly reciprocal: a modified design must be shared under ${name}. ${parent.creditDuty}`;
    case 'CERN-OHL-W-2.0':
      return `${name} is reciprocal for the design itself: a modified design must be shared under ${name}, or under CERN-OHL-S v2, which the licence allows instead. ${parent.creditDuty}`;
    case 'CC-BY-4.0':
    case 'CERN-OHL-P-2.0':
    case 'MIT':
      return `${name} lets an adaptation use any licence that keeps the credit to the original, so anything except CC0 1.0. ${parent.creditDuty}`;
  }
}

export function adaptationRule(parentId: LicenceId): AdaptationRule {
  const parent = licenceInfo(parentId);
  const allowedChildIds = allowedChildren(parent);
  return {
    allowed: allowedChildIds.length > 0,
    allowedChildIds,
    mustKeepNonCommercial: parent.nonCommercial,
    attributionRequired: parent.attributionRequired,
    reason: ruleReason(parent, allowedChildIds),
  };
}

function refusal(parent: LicenceInfo, child: LicenceInfo, rule: AdaptationRule): string {
  if (!rule.allowed) return rule.reason;
  const choices = listNames(rule.allowedChildIds);
  if (parent.adaptation.kind === 'only') {
    return `${parent.shortName} requires an adaptation to be shared under ${choices}, not ${child.shortName}. ${parent.creditDuty}`;
  }
  if (parent.nonCommercial && !child.nonCommercial) {
    return `${parent.shortName} forbids commercial use, and ${child.shortName} would allow it. Choose a non-commercial licence: ${choices}.`;
  }
  return `${child.shortName} would drop the credit that ${parent.shortName} requires for the original author. Choose a licence that keeps it, such as ${parent.shortName}.`;
}

export function checkAdaptationLicence(parentId: LicenceId, childId: LicenceId): { ok: boolean; reason: string } {
  const parent = licenceInfo(parentId);
  const child = licenceInfo(childId);
  const rule = adaptationRule(parentId);
  if (!rule.allowedChildIds.includes(childId)) {
    return { ok: false, reason: refusal(parent, child, rule) };
  }
  return {
    ok: true,
    reason: `An adaptation of a ${parent.shortName} part may be shared under ${child.shortName}. ${parent.creditDuty}`,
  };
}
