// How the client writes numbers, sizes, money, counts, dates and relative days: every figure a page shows
// goes through here and through Intl, in one locale, so no view calls toLocale* or builds a date by hand.
// Lengths are millimetres first, inches after.
import { minorToDecimal } from '@shared/print-price';
import type { PartStatus, RevisionStatus } from '@shared/types';
import { DEFAULT_CURRENCY } from '@shared/money';
import { mmToInches } from '@shared/units';

/**
 * The one locale decision. The wording is English; en-GB writes dates day-month-year with a 24-hour
 * time ("13 Apr 2026, 14:05") and groups thousands with commas. Fixed rather than the browser's, so a
 * page never mixes two orders of day and month with its English text.
 */
export const LOCALE = 'en-GB';

const numberFormats = new Map<string, Intl.NumberFormat>();

/** Intl.NumberFormat in LOCALE, built once per set of options. */
function numberFormat(options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = JSON.stringify(options);
  let f = numberFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(LOCALE, options);
    numberFormats.set(key, f);
  }
  return f;
}

/** Exactly `digits` decimals, like toFixed: 2.5 → "2.50"; grouping only when asked. "-0" is written "0". */
export function formatFixed(n: number, digits: number, grouping = false): string {
  return numberFormat({ minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: grouping, signDisplay: 'negative' }).format(n);
}

/** At most `digits` decimals, trailing zeros dropped: 12.70 → "12.7". */
export function formatUpTo(n: number, digits: number, grouping = false): string {
  return numberFormat({ maximumFractionDigits: digits, useGrouping: grouping, signDisplay: 'negative' }).format(n);
}

type Size = readonly [number, number, number];

/** 20 → "20", 12.7 → "12.7", 0.254 → "0.25": one decimal, two below 1 mm. */
export function formatMm(mm: number): string {
  return formatUpTo(mm, Math.abs(mm) < 1 && mm !== 0 ? 2 : 1);
}

export function formatInches(mm: number): string {
  return formatFixed(mmToInches(mm), 2);
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
  return `${cm3 < 10 ? formatFixed(cm3, 1) : formatFixed(cm3, 0, true)} cm³ (${in3 < 10 ? formatFixed(in3, 2) : formatFixed(in3, 1)} in³)`;
}

/** File sizes in binary steps, as upload limits are set: 512 → "512 B", 2048 → "2 KB", 15 MiB → "15 MB". */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${formatFixed(bytes, 0)} B`;
  if (bytes < 1024 * 1024) return `${formatFixed(bytes / 1024, 0)} KB`;
  return `${formatUpTo(bytes / 1024 / 1024, 1, true)} MB`;
}

/** 12345 → "12,345" */
export function formatCount(n: number): string {
  return numberFormat({}).format(n);
}

// One way to write a date on every page: "13 Apr 2026", with the time after it where it matters
// ("13 Apr 2026, 14:05"). Times are the device's clock, written in LOCALE's order.
const DATE = new Intl.DateTimeFormat(LOCALE, { day: 'numeric', month: 'short', year: 'numeric' });
const DATE_TIME = new Intl.DateTimeFormat(LOCALE, { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hour12: false });
const TIME = new Intl.DateTimeFormat(LOCALE, { hour: '2-digit', minute: '2-digit', hour12: false });
const PLURALS = new Intl.PluralRules(LOCALE);
const RELATIVE = new Intl.RelativeTimeFormat(LOCALE, { numeric: 'auto' });

/** A moment (ISO string or Date) as its local day: "13 Apr 2026". */
export function formatDate(at: string | Date): string {
  return DATE.format(typeof at === 'string' ? new Date(at) : at);
}

/** A moment with its local time: "13 Apr 2026, 14:05". */
export function formatDateTime(at: string | Date): string {
  return DATE_TIME.format(typeof at === 'string' ? new Date(at) : at);
}

/** The local time of a moment: "14:05". */
export function formatTime(at: string | Date): string {
  return TIME.format(typeof at === 'string' ? new Date(at) : at);
}

/** "04:31 on 3 Dec 2026": when a stored copy was saved, on the device's clock. */
export function formatAsOf(at: string | Date): string {
  return `${formatTime(at)} on ${formatDate(at)}`;
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
  return formatFixed(mean, 1);
}

/** 0.784 → "78 %" */
export function formatPercent(share: number): string {
  return `${formatFixed(share * 100, 0)} %`;
}

/** The set-report counts, first and as crews say them: "2 of 2 held up". */
export function formatHeldUp(heldUp: number, reports: number): string {
  return `${formatCount(heldUp)} of ${formatCount(reports)} held up`;
}

/**
 * A count with its noun, the form chosen by LOCALE's plural rules: "1 report", "3 reports",
 * "0 bodies". The words may carry their verb: plural(n, 'item does', 'items do').
 */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${pluralWord(n, one, many)}`;
}

/** Only the word of plural(): pluralWord(1, 'sheet') → "sheet". */
export function pluralWord(n: number, one: string, many = `${one}s`): string {
  return PLURALS.select(n) === 'one' ? one : many;
}

/** Whole days from today, as words: 0 → "today", 1 → "tomorrow", 3 → "in 3 days", −2 → "2 days ago". */
export function formatRelativeDays(days: number): string {
  return RELATIVE.format(days, 'day');
}

// ---- prep day: filament, time, money, heat and shoot dates ------------------------------------

/** 82.4 → "82 g", 1234 → "1.23 kg" */
export function formatGrams(g: number): string {
  if (g >= 1000) return `${formatFixed(g / 1000, 2, true)} kg`;
  return `${g < 10 ? formatFixed(g, 1) : formatFixed(g, 0)} g`;
}

/** 12.345 → "12.3 m" */
export function formatMetres(m: number): string {
  return `${m < 10 ? formatFixed(m, 2) : m < 100 ? formatFixed(m, 1) : formatFixed(m, 0, true)} m`;
}

/** 2.58 → "2 h 35 min", 0.4 → "24 min" */
export function formatHours(hours: number): string {
  const minutes = Math.round(hours * 60);
  if (minutes < 60) return `${formatCount(minutes)} min`;
  const h = formatCount(Math.floor(minutes / 60));
  const m = minutes % 60;
  return m ? `${h} h ${formatCount(m)} min` : `${h} h`;
}

/** Money with its currency (ISO 4217, the price sheet's): 1234.5 EUR → "€1,234.50". */
export function formatMoney(amount: number, currency: string = DEFAULT_CURRENCY): string {
  return numberFormat({ style: 'currency', currency, currencyDisplay: 'symbol' }).format(amount);
}

/** Heat to the whole degree, as the estimates behind it allow: 69.4 → "69 °C (157 °F)" */
export function formatCelsius(c: number): string {
  return `${formatFixed(c, 0)} °C (${formatFixed((c * 9) / 5 + 32, 0)} °F)`;
}

/** A calendar day ("2026-04-13") as a local date: no time zone shifts it to the day before. */
export function parseDay(day: string): Date {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(y, m - 1, d);
}

/** The local calendar day of a moment as "2026-04-13" (date inputs, API days); parseDay's inverse. */
export function isoDay(at: Date = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${at.getFullYear()}-${pad(at.getMonth() + 1)}-${pad(at.getDate())}`;
}

/** A calendar day, written like every other date: "13 Apr 2026". */
export function formatDay(day: string): string {
  return formatDate(parseDay(day));
}

/** "13 Apr 2026 – 24 Apr 2026", one day, or null without dates. */
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
    return formatMoney(Number(decimal), currency);
  } catch {
    return `${decimal} ${currency}`;
  }
}

/** ISO 4217 currencies the browser knows, named in English: "EUR · Euro". Common ones first. */
export const CURRENCY_OPTIONS: { value: string; label: string }[] = (() => {
  const codes = (Intl as unknown as { supportedValuesOf?: (key: string) => string[] }).supportedValuesOf?.('currency') ?? ['EUR', 'GBP', 'USD'];
  let names: Intl.DisplayNames | null = null;
  try {
    names = new Intl.DisplayNames([LOCALE], { type: 'currency' });
  } catch {
    names = null;
  }
  const first = ['EUR', 'GBP', 'USD', 'CAD', 'AUD', 'CHF', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK', 'NZD'];
  const ordered = [...first.filter((c) => codes.includes(c)), ...codes.filter((c) => !first.includes(c))];
  return ordered.map((code) => ({ value: code, label: `${code} · ${names?.of(code) ?? code}` }));
})();
