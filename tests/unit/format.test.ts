import { describe, expect, it } from 'vitest';
import { formatCelsius, formatDate, formatDateTime, formatDay, formatHeldUp, formatMoney, formatShootDays } from '@/lib/format';

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
