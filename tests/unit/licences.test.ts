import spdx from 'spdx-license-list';
import { describe, expect, it } from 'vitest';
import { LICENCE_IDS, adaptationRule, checkAdaptationLicence, isLicenceId, licenceInfo, type LicenceId } from '@shared/licences';

describe('licence table', () => {
  // Source: the SPDX License List as packaged in npm `spdx-license-list`.
  it.each(LICENCE_IDS)('licence table · %s · an SPDX id with the same name and URL', (id) => {
    const entry = spdx[id];
    expect(entry, `${id} missing from spdx-license-list`).toBeDefined();
    expect(licenceInfo(id).name).toBe(entry.name);
    expect(licenceInfo(id).url).toBe(entry.url);
  });

  it('licence table · all entries · twelve licences, no duplicates', () => {
    expect(new Set(LICENCE_IDS).size).toBe(12);
  });

  it('licence table · ids · only its own recognised', () => {
    expect(isLicenceId('CC-BY-SA-4.0')).toBe(true);
    expect(isLicenceId('GPL-3.0')).toBe(false);
    expect(isLicenceId(undefined)).toBe(false);
  });

  // Licence elements as named in each CC 4.0 legal code §1 ("License Elements means …").
  it.each([
    ['CC-BY-4.0', { attributionRequired: true, shareAlike: false, nonCommercial: false, noDerivatives: false }],
    ['CC-BY-SA-4.0', { attributionRequired: true, shareAlike: true, nonCommercial: false, noDerivatives: false }],
    ['CC-BY-NC-4.0', { attributionRequired: true, shareAlike: false, nonCommercial: true, noDerivatives: false }],
    ['CC-BY-NC-SA-4.0', { attributionRequired: true, shareAlike: true, nonCommercial: true, noDerivatives: false }],
    ['CC-BY-ND-4.0', { attributionRequired: true, shareAlike: false, nonCommercial: false, noDerivatives: true }],
    ['CC-BY-NC-ND-4.0', { attributionRequired: true, shareAlike: false, nonCommercial: true, noDerivatives: true }],
    // CC0 1.0 §2 "Waiver": no conditions at all.
    ['CC0-1.0', { attributionRequired: false, shareAlike: false, nonCommercial: false, noDerivatives: false }],
    // GPL v3 §4–5 keep notices and §5(c) licence the whole work; CERN-OHL v2 §3.3 retain
    // Notices, with §3.3(d) reciprocity in W and S; MIT: "The above copyright notice … shall be included".
    ['GPL-3.0-or-later', { attributionRequired: true, shareAlike: true, nonCommercial: false, noDerivatives: false }],
    ['CERN-OHL-P-2.0', { attributionRequired: true, shareAlike: false, nonCommercial: false, noDerivatives: false }],
    ['CERN-OHL-W-2.0', { attributionRequired: true, shareAlike: true, nonCommercial: false, noDerivatives: false }],
    ['CERN-OHL-S-2.0', { attributionRequired: true, shareAlike: true, nonCommercial: false, noDerivatives: false }],
    ['MIT', { attributionRequired: true, shareAlike: false, nonCommercial: false, noDerivatives: false }],
  ] as const)('%s has the right flags', (id, flags) => {
    expect(licenceInfo(id)).toMatchObject(flags);
  });
});

// Columns (child licence), in this order:
const COLUMNS: readonly LicenceId[] = [
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
];

// Row = parent licence; 1 = an adaptation may be shared under the column's licence.
//                                  BY SA NC NCSA ND NCND CC0 P W S GPL MIT
const EXPECTED: Record<LicenceId, readonly number[]> = {
  // CC BY 4.0 §3(a)(4): the adapter's licence "must not prevent recipients … from complying";
  // §3(a)(1) attribution survives, so CC0 (which tells people nothing is owed) is refused.
  'CC-BY-4.0': /*               */ [1, 1, 1, 1, 1, 1, 0, 1, 1, 1, 1, 1],
  // CC BY-SA 4.0 §3(b)(1): same licence elements, this version or later, or a BY-SA Compatible
  // License (§1(c), creativecommons.org/compatiblelicenses: GPL v3, announced 8 Oct 2015).
  'CC-BY-SA-4.0': /*            */ [0, 1, 0, 0, 0, 0, 0, 0, 0, 0, 1, 0],
  // CC BY-NC 4.0 §2(a)(1)(B): adapted material for NonCommercial purposes only, and §3(a)(4)
  // as for BY. Choice: an NC-ND licence on the adaptation is accepted (it keeps BY and NC).
  'CC-BY-NC-4.0': /*            */ [0, 0, 1, 1, 0, 1, 0, 0, 0, 0, 0, 0],
  // CC BY-NC-SA 4.0 §3(b)(1): same licence elements; CC lists no compatible licence for it.
  'CC-BY-NC-SA-4.0': /*         */ [0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 0],
  // CC BY-ND 4.0 §2(a)(1)(B): "produce and reproduce, but not Share, Adapted Material".
  'CC-BY-ND-4.0': /*            */ [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0],
  // CC BY-NC-ND 4.0 §2(a)(1)(B): the same, for NonCommercial purposes only.
  'CC-BY-NC-ND-4.0': /*         */ [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0],
  // CC0 1.0 §2: all rights waived, so any licence may be applied.
  'CC0-1.0': /*                 */ [1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1],
  // CERN-OHL-P v2 §3.3(a) retain Notices and §3.4 other licence terms allowed: anything but CC0.
  'CERN-OHL-P-2.0': /*          */ [1, 1, 1, 1, 1, 1, 0, 1, 1, 1, 1, 1],
  // CERN-OHL-W v2 §3.3(d) licence modifications under this Licence; §8.3 "You may treat Covered
  // Source licensed under CERN-OHL-W as licensed under CERN-OHL-S" (given compliant components).
  'CERN-OHL-W-2.0': /*          */ [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 0, 0],
  // CERN-OHL-S v2 §3.3(d): modified Covered Source under this Licence only.
  'CERN-OHL-S-2.0': /*          */ [0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 0, 0],
  // GPL v3 §5(c): "license the entire work, as a whole, under this License".
  'GPL-3.0-or-later': /*        */ [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 0],
  // MIT: any terms, but the copyright and permission notice must be kept (our reading of the
  // notice clause, common practice), so CC0 is refused.
  MIT: /*                       */ [1, 1, 1, 1, 1, 1, 0, 1, 1, 1, 1, 1],
};

const PAIRS = LICENCE_IDS.flatMap((parent) => COLUMNS.map((child, column) => ({ parent, child, ok: EXPECTED[parent][column] === 1 })));

describe('adaptation licences', () => {
  it('adaptation licences · the matrix · covers all 144 ordered pairs', () => {
    expect(COLUMNS).toEqual(LICENCE_IDS);
    expect(PAIRS).toHaveLength(144);
  });

  it.each(PAIRS)('adaptation licences · $parent → $child · ok = $ok', ({ parent, child, ok }) => {
    const result = checkAdaptationLicence(parent, child);
    expect(result.ok).toBe(ok);
    expect(result.reason).toMatch(/^[A-Z].+\.$/);
    expect(adaptationRule(parent).allowedChildIds.includes(child)).toBe(ok);
  });

  it.each(LICENCE_IDS)('adaptation licences · the rule for %s · agrees with its flags', (parent) => {
    const rule = adaptationRule(parent);
    const info = licenceInfo(parent);
    expect(rule.allowed).toBe(!info.noDerivatives);
    expect(rule.mustKeepNonCommercial).toBe(info.nonCommercial);
    expect(rule.attributionRequired).toBe(info.attributionRequired);
    expect(rule.reason).toMatch(/^[A-Z].+\.$/);
  });

  it('adaptation licences · a refusal · explained in terms a crew member can act on', () => {
    expect(checkAdaptationLicence('CC-BY-ND-4.0', 'CC-BY-4.0').reason).toMatch(/only unchanged/);
    expect(checkAdaptationLicence('CC-BY-4.0', 'CC0-1.0').reason).toMatch(/drop the credit/);
    expect(checkAdaptationLicence('CC-BY-NC-4.0', 'CC-BY-4.0').reason).toMatch(/forbids commercial use/);
    expect(checkAdaptationLicence('CC-BY-SA-4.0', 'CC-BY-4.0').reason).toMatch(/CC BY-SA 4\.0 or GPL v3 or later, not CC BY 4\.0/);
  });

  it('adaptation licences · an allowed adaptation · tells the adapter what credit to give', () => {
    expect(checkAdaptationLicence('CC-BY-4.0', 'CC-BY-SA-4.0').reason).toMatch(/Credit the original author/);
    expect(checkAdaptationLicence('MIT', 'MIT').reason).toMatch(/copyright and permission notice/);
  });
});
