import { describe, expect, it } from 'vitest';
import {
  formatAsOf,
  formatBytes,
  formatCelsius,
  formatCount,
  formatDate,
  formatDateTime,
  formatDay,
  formatFixed,
  formatGrams,
  formatHeldUp,
  formatHours,
  formatMetres,
  formatMinor,
  formatMm,
  formatMoney,
  formatRelativeDays,
  formatShootDays,
  formatTime,
  formatUpTo,
  formatVolume,
  isoDay,
  LOCALE,
  parseDay,
  plural,
  pluralWord,
} from '@/lib/format';

describe('format · dates', () => {
  it('format · a moment and a calendar day on one page · read in the same day month year order', () => {
    // noon UTC stays on the same calendar day in every time zone from UTC−11 to UTC+11
    expect(formatDate('2026-04-13T12:00:00Z')).toBe('13 Apr 2026');
    expect(formatDay('2026-04-13')).toBe('13 Apr 2026');
    expect(formatShootDays('2026-04-13', '2026-04-24')).toBe('13 Apr 2026 – 24 Apr 2026');
  });

  it('format · a moment with its time · is the same date with a 24-hour time after it', () => {
    const at = new Date(2026, 3, 13, 14, 5);
    expect(formatDateTime(at)).toBe('13 Apr 2026, 14:05');
  });
});

describe('format · money and heat', () => {
  it('format · a cost · carries the currency of the price sheet', () => {
    // ISO 4217 codes; symbols as ICU writes them for en-GB
    expect(formatMoney(1234.5, 'EUR')).toBe('€1,234.50');
    expect(formatMoney(12, 'GBP')).toBe('£12.00');
    expect(formatMoney(3.2, 'USD')).toBe('US$3.20');
    expect(formatMoney(3.2)).toBe('€3.20');
  });

  it('format · a dashboard in sun at 69.4 °C · is shown to the whole degree', () => {
    // Vanos et al., Temperature 2018: 69.4 °C; °F = °C × 9/5 + 32 = 156.9
    expect(formatCelsius(69.4)).toBe('69 °C (157 °F)');
    expect(formatCelsius(46.7)).toBe('47 °C (116 °F)');
  });

  it('format · set-report counts · come first as crews say them', () => {
    expect(formatHeldUp(2, 2)).toBe('2 of 2 held up');
  });
});

describe('format · the one locale', () => {
  it('format · every writer · uses en-GB', () => {
    expect(LOCALE).toBe('en-GB');
  });

  it('format · a moment on the device clock · is a 24-hour time before its date', () => {
    // en-GB's CLDR time pattern is HH:mm (24-hour)
    expect(formatTime(new Date(2026, 11, 3, 4, 31))).toBe('04:31');
    expect(formatAsOf(new Date(2026, 11, 3, 4, 31))).toBe('04:31 on 3 Dec 2026');
  });

  it('format · a calendar day and back · keeps the local day', () => {
    expect(isoDay(new Date(2026, 0, 5, 23, 59))).toBe('2026-01-05');
    expect(isoDay(parseDay('2026-04-13'))).toBe('2026-04-13');
  });
});

describe('format · plurals', () => {
  it('format · counts of one, none and many · take the CLDR English plural form', () => {
    // CLDR plural rules for English: "one" is i = 1 and v = 0, everything else "other"
    // (unicode.org/cldr/charts/latest/supplemental/language_plural_rules.html; MDN's
    // Intl.PluralRules example: select(0) → "other", select(1) → "one", select(2) → "other")
    expect(plural(1, 'report')).toBe('1 report');
    expect(plural(0, 'report')).toBe('0 reports');
    expect(plural(2, 'body', 'bodies')).toBe('2 bodies');
    expect(plural(2, 'item does', 'items do')).toBe('2 items do');
    expect(pluralWord(1, 'sheet')).toBe('sheet');
    expect(pluralWord(1.5, 'day')).toBe('days');
  });

  it('format · a large count · is grouped by thousands', () => {
    // en-GB groups with a comma every three digits (CLDR en-GB decimal pattern #,##0.###)
    expect(plural(12345, 'facet')).toBe('12,345 facets');
    expect(formatCount(1234567)).toBe('1,234,567');
  });
});

describe('format · relative days', () => {
  it('format · days from today · read as words the way Intl.RelativeTimeFormat writes them', () => {
    // MDN Intl.RelativeTimeFormat, numeric: "auto": format(1, "day") → "tomorrow",
    // format(-1, "day") → "yesterday"; CLDR en relative day: "today", "in {0} days", "{0} days ago"
    expect(formatRelativeDays(0)).toBe('today');
    expect(formatRelativeDays(1)).toBe('tomorrow');
    expect(formatRelativeDays(3)).toBe('in 3 days');
    expect(formatRelativeDays(-1)).toBe('yesterday');
    expect(formatRelativeDays(-2)).toBe('2 days ago');
  });
});

describe('format · numbers and sizes', () => {
  it('format · decimals · round like toFixed and never write minus zero', () => {
    // ECMA-402 NumberFormat rounds half away from zero ("halfExpand", the default roundingMode)
    expect(formatFixed(2.5, 2)).toBe('2.50');
    expect(formatFixed(0.125, 2)).toBe('0.13');
    expect(formatFixed(-0.01, 1)).toBe('0.0');
    expect(formatUpTo(15.875, 2)).toBe('15.88');
    expect(formatUpTo(12.7, 2)).toBe('12.7');
  });

  it('format · lengths in mm · one decimal, two below a millimetre', () => {
    expect(formatMm(20)).toBe('20');
    expect(formatMm(12.7)).toBe('12.7');
    expect(formatMm(0.254)).toBe('0.25');
    expect(formatMm(-0.04)).toBe('-0.04');
  });

  it('format · a volume · in cm³ and in³ (1 in³ = 16.387064 cm³, exact from 25.4 mm)', () => {
    // 25.4³ = 16 387.064 mm³ (NIST SP 811, B.8)
    expect(formatVolume(16387.064)).toBe('16 cm³ (1.00 in³)');
    expect(formatVolume(6000)).toBe('6.0 cm³ (0.37 in³)');
    expect(formatVolume(12_345_678)).toBe('12,346 cm³ (753.4 in³)');
  });

  it('format · file sizes · in binary steps as the upload limits are set', () => {
    expect(formatBytes(512)).toBe('512 B');
    expect(formatBytes(2048)).toBe('2 KB');
    expect(formatBytes(15 * 1024 * 1024)).toBe('15 MB');
    expect(formatBytes(1.25 * 1024 * 1024)).toBe('1.3 MB');
  });

  it('format · filament and print time · grams, metres, hours and minutes', () => {
    expect(formatGrams(82.4)).toBe('82 g');
    expect(formatGrams(1234)).toBe('1.23 kg');
    expect(formatMetres(12.345)).toBe('12.3 m');
    expect(formatMetres(1234.4)).toBe('1,234 m');
    expect(formatHours(2.58)).toBe('2 h 35 min');
    expect(formatHours(0.4)).toBe('24 min');
    expect(formatHours(3)).toBe('3 h');
  });

  it('format · minor units · follow the ISO 4217 decimals of the currency', () => {
    // ISO 4217: EUR has 2 decimals, JPY 0; CLDR en-GB symbols € and JP¥
    expect(formatMinor(1250, 'EUR')).toBe('€12.50');
    expect(formatMinor(1250, 'JPY')).toBe('JP¥1,250');
  });
});
