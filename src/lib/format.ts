// How the client writes numbers, sizes and statuses. Lengths are millimetres first, inches after.
import { minorToDecimal } from '@shared/print-price';
import type { PartStatus, RevisionStatus } from '@shared/types';
import { DEFAULT_CURRENCY } from '@shared/money';
import { mmToInches } from '@shared/units';

type Size = readonly [number, number, number];

/** 20 → "20", 12.7 → "12.7", 0.254 → "0.25": one decimal, two below 1 mm. */
export function formatMm(mm: number): string {
  const digits = Math.abs(mm) < 1 && mm !== 0 ? 2 : 1;
  return String(Number(mm.toFixed(digits)));
}

export function formatInches(mm: number): string {
  return mmToInches(mm).toFixed(2);
}

/** "20 × 30 × 10 mm" */
export function formatSizeMm(size: Size): string {
  return `${size.map(formatMm).join(' × ')} mm`;
}

/** "0.79 × 1.18 × 0.39 in" */
export function formatSizeIn(size: Size): string {
  return `${size.map(formatInches).join(' × ')} in`;
}

/** 6000 mm³ → "6.0 cm³ (0.37 in³)" */
export function formatVolume(mm3: number): string {
  const cm3 = mm3 / 1000;
  const in3 = mm3 / 16387.064; // 25.4³, exact
  return `${cm3 < 10 ? cm3.toFixed(1) : Math.round(cm3).toLocaleString('en-US')} cm³ (${in3 < 10 ? in3.toFixed(2) : in3.toFixed(1)} in³)`;
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(0)} KB`;
  return `${Number((bytes / 1024 / 1024).toFixed(1))} MB`;
}

export function formatCount(n: number): string {
  return n.toLocaleString('en-US');
}

// One way to write a date on every page: "13 Apr 2026", with the time after it where it matters
// ("13 Apr 2026, 14:05"). Written in one fixed locale so a page never mixes two orders of day and month.
const DATE_LOCALE = 'en-GB';
const DATE = new Intl.DateTimeFormat(DATE_LOCALE, { day: 'numeric', month: 'short', year: 'numeric' });
const DATE_TIME = new Intl.DateTimeFormat(DATE_LOCALE, { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hour12: false });

/** A moment (ISO string or Date) as its local day: "13 Apr 2026". */
export function formatDate(at: string | Date): string {
  return DATE.format(typeof at === 'string' ? new Date(at) : at);
}

/** A moment with its local time: "13 Apr 2026, 14:05". */
export function formatDateTime(at: string | Date): string {
  return DATE_TIME.format(typeof at === 'string' ? new Date(at) : at);
}

export interface StatusWording {
  label: string;
  icon: string;
  /** Class suffix for PartStatusTag's colours. */
  tone: 'shelf' | 'desk' | 'back' | 'no' | 'off';
}

export const STATUS_WORDING: Record<PartStatus | RevisionStatus, StatusWording> = {
  draft: { label: 'Not sent yet', icon: 'pi pi-pencil', tone: 'off' },
  in_review: { label: 'At the review desk', icon: 'pi pi-clock', tone: 'desk' },
  published: { label: 'On the shelf', icon: 'pi pi-check', tone: 'shelf' },
  sent_back: { label: 'Sent back for changes', icon: 'pi pi-replay', tone: 'back' },
  rejected: { label: 'Turned down', icon: 'pi pi-times', tone: 'no' },
  retired: { label: 'Taken off the shelf', icon: 'pi pi-inbox', tone: 'off' },
  superseded: { label: 'Replaced by a newer revision', icon: 'pi pi-history', tone: 'off' },
};

/** What each level of a rating out of 5 says, lowest first (index 0 is level 1). */
export const RATING_WORDS = ['Keep it off the rig', 'Needs work', 'Does the job', 'Solid', 'First thing on the cart'] as const;

export function ratingWord(level: number): string {
  return RATING_WORDS[level - 1] ?? '';
}

/** 4.25 → "4.3" */
export function formatMean(mean: number): string {
  return mean.toFixed(1);
}

/** 0.784 → "78 %" */
export function formatPercent(share: number): string {
  return `${Math.round(share * 100)} %`;
}

/** The set-report counts, first and as crews say them: "2 of 2 held up". */
export function formatHeldUp(heldUp: number, reports: number): string {
  return `${formatCount(heldUp)} of ${formatCount(reports)} held up`;
}

/** "1 report", "3 reports" */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

// ---- prep day: filament, time, money, heat and shoot dates ------------------------------------

/** 82.4 → "82 g", 1234 → "1.23 kg" */
export function formatGrams(g: number): string {
  if (g >= 1000) return `${(g / 1000).toFixed(2)} kg`;
  return `${g < 10 ? g.toFixed(1) : Math.round(g)} g`;
}

/** 12.345 → "12.3 m" */
export function formatMetres(m: number): string {
  return `${m < 10 ? m.toFixed(2) : m < 100 ? m.toFixed(1) : Math.round(m).toLocaleString('en-US')} m`;
}

/** 2.58 → "2 h 35 min", 0.4 → "24 min" */
export function formatHours(hours: number): string {
  const minutes = Math.round(hours * 60);
  if (minutes < 60) return `${minutes} min`;
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return m ? `${h.toLocaleString('en-US')} h ${m} min` : `${h.toLocaleString('en-US')} h`;
}

const moneyFormats = new Map<string, Intl.NumberFormat>();

/** Money with its currency (ISO 4217, the price sheet's): 1234.5 EUR → "€1,234.50". */
export function formatMoney(amount: number, currency: string = DEFAULT_CURRENCY): string {
  let f = moneyFormats.get(currency);
  if (!f) {
    f = new Intl.NumberFormat('en-GB', { style: 'currency', currency, currencyDisplay: 'symbol' });
    moneyFormats.set(currency, f);
  }
  return f.format(amount);
}

/** Heat to the whole degree, as the estimates behind it allow: 69.4 → "69 °C (157 °F)" */
export function formatCelsius(c: number): string {
  return `${Math.round(c)} °C (${Math.round((c * 9) / 5 + 32)} °F)`;
}

/** A calendar day ("2026-04-13") as a local date: no time zone shifts it to the day before. */
export function parseDay(day: string): Date {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(y, m - 1, d);
}

/** A calendar day, written like every other date: "13 Apr 2026". */
export function formatDay(day: string): string {
  return formatDate(parseDay(day));
}

/** "Mon, Apr 13, 2026 – Fri, Apr 24, 2026", one day, or null without dates. */
export function formatShootDays(startsOn: string | null, endsOn: string | null): string | null {
  if (startsOn && endsOn && startsOn !== endsOn) return `${formatDay(startsOn)} – ${formatDay(endsOn)}`;
  const one = startsOn ?? endsOn;
  return one ? formatDay(one) : null;
}

/** Whole days from today to a calendar day (negative once it has passed). */
export function daysUntil(day: string, today = new Date()): number {
  const start = new Date(today.getFullYear(), today.getMonth(), today.getDate());
  return Math.round((parseDay(day).getTime() - start.getTime()) / 86_400_000);
}

/** An amount in minor units (cents) of an ISO 4217 currency, e.g. 1250 EUR → "€12.50". */
export function formatMinor(minor: number, currency: string): string {
  const decimal = minorToDecimal(minor, currency);
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(Number(decimal));
  } catch {
    return `${decimal} ${currency}`;
  }
}

/** ISO 4217 currencies the browser knows, named in English: "EUR · Euro". Common ones first. */
export const CURRENCY_OPTIONS: { value: string; label: string }[] = (() => {
  const codes = (Intl as unknown as { supportedValuesOf?: (key: string) => string[] }).supportedValuesOf?.('currency') ?? ['EUR', 'GBP', 'USD'];
  let names: Intl.DisplayNames | null = null;
  try {
    names = new Intl.DisplayNames(['en'], { type: 'currency' });
  } catch {
    names = null;
  }
  const first = ['EUR', 'GBP', 'USD', 'CAD', 'AUD', 'CHF', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK', 'NZD'];
  const ordered = [...first.filter((c) => codes.includes(c)), ...codes.filter((c) => !first.includes(c))];
  return ordered.map((code) => ({ value: code, label: `${code} · ${names?.of(code) ?? code}` }));
})();
