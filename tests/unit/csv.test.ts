import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvField, guardFormula, toCsv } from '@shared/csv';

describe('csv · quoting', () => {
  it('csvField · commas, quotes, line breaks and edge spaces · quoted with quotes doubled (RFC 4180 §2.6–2.7)', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a, b')).toBe('"a, b"');
    expect(csvField('the "big" box')).toBe('"the ""big"" box"');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(' padded ')).toBe('" padded "');
    expect(csvField(null)).toBe('');
    expect(csvField(undefined)).toBe('');
    expect(csvField(Number.NaN)).toBe('');
  });

  it('toCsv · several records · CRLF after each (RFC 4180 §2.1–2.2)', () => {
    expect(
      toCsv([
        ['a', 1],
        ['b', 2],
      ]),
    ).toBe('a,1\r\nb,2\r\n');
  });

  it('toCsv · awkward text · papaparse (npm reference parser) reads back what was written', () => {
    const rows = [
      ['Part', 'Notes'],
      ['Yoke, 5"', 'line one\r\nline two'],
      ['“Curly” — ünïcode ×', '"quoted", and, commas'],
    ];
    const parsed = Papa.parse<string[]>(toCsv(rows), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual(rows);
  });
});

describe('csv · formula injection', () => {
  it('guardFormula · text a spreadsheet would run · gets a leading apostrophe (OWASP CSV Injection)', () => {
    for (const text of ['=1+1', '+1', '-1+2', '@SUM(A1)', '\tx', '\rx']) expect(guardFormula(text)).toBe(`'${text}`);
    expect(guardFormula('Cart printer')).toBe('Cart printer');
    expect(guardFormula('a=b')).toBe('a=b');
  });

  it('csvField · numbers we computed · written as numbers, negatives untouched', () => {
    expect(csvField(-3.2)).toBe('-3.2');
    expect(csvField(0)).toBe('0');
    expect(csvField('-3.2')).toBe("'-3.2");
  });

  it('csvField · a formula with a comma · guarded and then quoted', () => {
    const cell = '=HYPERLINK("http://x.test","click")';
    expect(csvField(cell)).toBe(`"'=HYPERLINK(""http://x.test"",""click"")"`);
    expect(Papa.parse<string[]>(csvField(cell)).data[0][0]).toBe(`'${cell}`);
  });
});
