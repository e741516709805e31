// How "Will it fit?" reads and writes the lengths it keeps in the address: a bare number takes the
// unit chosen on the form, a number typed with a unit keeps it ("3.5in", '3-1/2"', "90mm").
import { formatFixed } from '@/lib/format';

export type FitUnit = 'mm' | 'in';

const INCH_MARK = /\s*(?:in|inch|inches|"|″|”)\s*$/i;
const MM_MARK = /\s*(?:mm)\s*$/i;
const BARE = /^\s*(?:\d+(?:\.\d*)?|\.\d+|\d+\s*\/\s*\d+|\d+[\s-]+\d+\s*\/\s*\d+)\s*$/;

/** A bare number takes the chosen unit; anything typed with a unit keeps it. */
export function withUnit(text: string, unit: FitUnit): string {
  const t = text.trim();
  return unit === 'in' && BARE.test(t) ? `${t.replace(/\s+/g, ' ')}in` : t;
}

/** "120x80x40" → its three sides as typed. */
export function splitFit(text: string): string[] {
  return text ? text.trim().split(/\s*[×xX*]\s*/) : [];
}

/** "rod bore:15.2:0.3" → name, value and tolerance; a name may itself hold a colon. */
export function splitDim(text: string): { name: string; value: string; tol: string } {
  const f = text.split(':');
  if (f.length < 2) return { name: text, value: '', tol: '' };
  if (f.length === 2) return { name: f[0], value: f[1], tol: '' };
  return { name: f.slice(0, -2).join(':'), value: f[f.length - 2], tol: f[f.length - 1] };
}

/** Inches when every length says so; otherwise millimetres (the others keep the unit they were typed in). */
export function unitOf(lengths: string[]): FitUnit {
  return lengths.length && lengths.every((t) => INCH_MARK.test(t)) ? 'in' : 'mm';
}

/** The length without the form's own unit mark, as it is shown in the field. */
export function stripUnit(text: string, unit: FitUnit): string {
  return text.trim().replace(unit === 'in' ? INCH_MARK : MM_MARK, '');
}

/** A tolerance in inches: three decimals below 0.1 in, two above. */
export function toleranceInches(mm: number): string {
  const inches = (mm * 10) / 254;
  return formatFixed(inches, inches < 0.1 ? 3 : 2);
}
