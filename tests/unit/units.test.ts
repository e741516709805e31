import { describe, expect, it } from 'vitest';
import { MOUNT_STANDARDS } from '@shared/catalogue';
import { resolveMount } from '@shared/search/aliases';
import { MM_PER_INCH, inchesToMm, mmToInches, moduleOfDiametralPitch, parseLength } from '@shared/units';

describe('inch conversion', () => {
  it('inch conversion · 1 in · exactly 25.4 mm', () => {
    // International yard and pound agreement, 1959; NIST SP 811 Appendix B.
    expect(MM_PER_INCH).toBe(25.4);
    expect(inchesToMm(1)).toBe(25.4);
    expect(mmToInches(25.4)).toBe(1);
  });

  it('inch conversion · camera thread sizes · converted without float noise', () => {
    // ISO 1222 / ASME B1.1 designations: 1/4 in = 6.35 mm, 3/8 in = 9.525 mm (trade reference).
    expect(inchesToMm(0.25)).toBe(6.35);
    expect(inchesToMm(0.375)).toBe(9.525);
    // 38 mm tripod-head dovetail: 1.5 in = 38.1 mm (trade reference, secondary).
    expect(inchesToMm(1.5)).toBe(38.1);
    expect(inchesToMm(3.5)).toBe(88.9);
    expect(mmToInches(6.35)).toBe(0.25);
  });

  it('inch conversion · there and back · round-trips', () => {
    for (const mm of [0, 0.1, 1, 15, 19, 60, 104, 300]) {
      expect(inchesToMm(mmToInches(mm))).toBeCloseTo(mm, 12);
    }
  });
});

describe('parseLength', () => {
  it.each([
    ['15', 15],
    ['15mm', 15],
    ['15 mm', 15],
    [' 15 MM ', 15],
    ['0.4 mm', 0.4],
    ['.5mm', 0.5],
    ['1.5 cm', 15],
    ['19 millimetres', 19],
  ])('parseLength · %j · %d mm', (text, mm) => {
    expect(parseLength(text)).toBe(mm);
  });

  // Expected values: inches × 25.4 (exact definition, NIST SP 811 Appendix B), worked by hand.
  it.each([
    ['3.5in', 88.9],
    ['3.5 in', 88.9],
    ['3.5"', 88.9],
    ['3.5 inches', 88.9],
    ['1/4"', 6.35], // 25.4 / 4
    ['1/4 inch', 6.35],
    ['3/8"', 9.525], // 25.4 × 3 / 8
    ['1-1/4in', 31.75], // 25.4 × 5 / 4
    ['1 1/4 in', 31.75],
    ['1.5″', 38.1],
    ['0.206 in', 5.2324], // MIL-STD-1913 slot width 0.206 in (trade reference: 5.23 mm)
  ])('reads %j as %d mm', (text, mm) => {
    expect(parseLength(text)).toBe(mm);
  });

  it.each(['', 'mm', 'abc', '-3 mm', '1/0"', '1-1/0 in', '3.5 ft', '3,5 mm', '15 mm mm', 'quarter inch', '1e3'])('parseLength · %j · rejected', (text) => {
    expect(parseLength(text)).toBeNull();
  });
});

describe('gears · 32 DP against module 0.8', () => {
  it('moduleOfDiametralPitch · 32 DP · module 0.79375, not 0.8 (m = 25.4 / DP, trade reference)', () => {
    expect(moduleOfDiametralPitch(32)).toBe(0.79375);
    expect(moduleOfDiametralPitch(32)).not.toBe(0.8);
    expect(() => moduleOfDiametralPitch(0)).toThrow(RangeError);
  });

  it('gears · 32 DP and module 0.8 · drift apart over a long run: 60 teeth differ by more than a millimetre of pitch line', () => {
    // Circular pitch p = π·m (ISO 53); over 60 teeth the difference is 60·π·(0.8 − 0.79375) ≈ 1.18 mm,
    // more than the backlash of a printed gear, so the two do not mesh over long runs.
    const drift = 60 * Math.PI * (0.8 - moduleOfDiametralPitch(32));
    expect(drift).toBeCloseTo(1.178, 3);
  });

  it('gears · the 0.8 module gear · is no longer found by "32 pitch", and its standard says why', () => {
    const gear = MOUNT_STANDARDS.find((m) => m.slug === 'gear-0-8')!;
    expect(gear.aliases.some((a) => /32/.test(a))).toBe(false);
    expect(gear.standard).toMatch(/32 DP is module 0\.79375/);
    expect(resolveMount('32 pitch')).toBeNull();
  });
});
