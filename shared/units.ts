// Lengths. Rigshelf stores and computes in millimetres; inches are accepted on input.

/** Exact by definition since the international yard and pound agreement of 1959. */
export const MM_PER_INCH = 25.4;

// 25.4 has no exact binary form, so scale by the integer 254 first and divide once:
// 3.5 in then gives 88.9 rather than 88.89999999999999.
export function inchesToMm(inches: number): number {
  return (inches * 254) / 10;
}

export function mmToInches(mm: number): number {
  return (mm * 10) / 254;
}

/** Spur-gear module (mm) of a diametral pitch (teeth per inch of pitch diameter): m = 25.4 / DP. */
export function moduleOfDiametralPitch(dp: number): number {
  if (!Number.isFinite(dp) || dp <= 0) throw new RangeError('The diametral pitch must be a number > 0.');
  return MM_PER_INCH / dp;
}

/** A parsed number kept as an integer fraction so the unit conversion rounds only once. */
interface Ratio {
  numerator: number;
  denominator: number;
}

type LengthUnit = 'mm' | 'cm' | 'in';

// Digit counts are capped so every intermediate product stays an exact integer in a double.
const NUMBER = String.raw`(\d{1,7})\s*[-\s]\s*(\d{1,6})\s*\/\s*(\d{1,6})|(\d{1,6})\s*\/\s*(\d{1,6})|(\d{1,7}(?:\.\d{0,6})?|\.\d{1,6})`;
const UNIT = String.raw`mm|millimet(?:re|er)s?|cm|centimet(?:re|er)s?|in|inch(?:es)?|"|″|”`;
const LENGTH_PATTERN = new RegExp(String.raw`^\s*(?:${NUMBER})\s*(${UNIT})?\s*$`, 'i');

function decimalRatio(text: string): Ratio {
  const [whole = '', fraction = ''] = text.split('.');
  const denominator = 10 ** fraction.length;
  return { numerator: Number(whole || '0') * denominator + Number(fraction || '0'), denominator };
}

function readRatio(groups: (string | undefined)[]): Ratio | null {
  const [mixedWhole, mixedTop, mixedBottom, top, bottom, decimal] = groups;
  if (mixedWhole !== undefined && mixedTop !== undefined && mixedBottom !== undefined) {
    const denominator = Number(mixedBottom);
    if (denominator === 0) return null;
    return { numerator: Number(mixedWhole) * denominator + Number(mixedTop), denominator };
  }
  if (top !== undefined && bottom !== undefined) {
    const denominator = Number(bottom);
    return denominator === 0 ? null : { numerator: Number(top), denominator };
  }
  return decimal === undefined ? null : decimalRatio(decimal);
}

function readUnit(text: string | undefined): LengthUnit {
  if (text === undefined) return 'mm';
  const unit = text.toLowerCase();
  if (unit.startsWith('c')) return 'cm';
  if (unit.startsWith('m')) return 'mm';
  return 'in';
}

const TENTHS_OF_MM_PER_UNIT: Record<LengthUnit, number> = { mm: 10, cm: 100, in: 254 };

/**
 * Reads a length typed by a person and returns it in millimetres, or null if it is not one.
 * A bare number is millimetres. Accepts decimals ("3.5 in"), fractions ("1/4\"") and mixed
 * numbers ("1-1/4in", "1 1/4 in"); units mm, cm, in / inch / inches / ".
 */
export function parseLength(text: string): number | null {
  const match = LENGTH_PATTERN.exec(text);
  if (!match) return null;
  const ratio = readRatio(match.slice(1, 7));
  if (!ratio) return null;
  const unit = readUnit(match[7]);
  return (ratio.numerator * TENTHS_OF_MM_PER_UNIT[unit]) / (ratio.denominator * 10);
}
