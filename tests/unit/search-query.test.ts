import { describe, expect, it } from 'vitest';
import { searchQuerySchema } from '@shared/schemas/search';
import { mountToken } from '@shared/search/aliases';
import { parseDimension, parseEnvelope, readQueryText, splitList } from '@shared/search/query';
import { normaliseQueryText } from '@shared/search/aliases';
import { synonymToken } from '@shared/search/synonyms';
import { fieldErrors } from '@shared/validation';

describe('parseEnvelope · fit', () => {
  it.each([
    ['120x80x40', [120, 80, 40]],
    ['120 x 80 x 40', [120, 80, 40]],
    ['120×80×40', [120, 80, 40]],
    ['120*80*40', [120, 80, 40]],
    ['120X80X40mm', [120, 80, 40]],
    ['12cm x 8cm x 4cm', [120, 80, 40]],
    // inch input, 1 in = 25.4 mm exactly (NIST SP 811 Appendix B): 4.5 in = 114.3, 3 in = 76.2, 1 in = 25.4
    ['4.5in x 3in x 1in', [114.3, 76.2, 25.4]],
    ['4.5"x3"x1"', [114.3, 76.2, 25.4]],
    ['3.5in x 3.5" x 1/4"', [88.9, 88.9, 6.35]],
    ['100 x 2.5in x 1-1/4in', [100, 63.5, 31.75]],
  ])('reads %j', (text, mm) => {
    expect(parseEnvelope(text)).toEqual({ ok: true, value: mm });
  });

  it.each([
    ['120x80', /three lengths/],
    ['120x80x40x10', /three lengths/],
    ['120xx40', /three lengths/],
    ['big x 80 x 40', /"big" is not a length/],
    ['0x80x40', /more than 0 mm/],
    ['6000x80x40', /more than 5 m/],
  ])('parseEnvelope · %j · refused with a message', (text, message) => {
    const r = parseEnvelope(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe('parseDimension · dim', () => {
  it('parseDimension · name:value:tolerance with units on value and tolerance · read', () => {
    expect(parseDimension('rod bore:15:0.3')).toEqual({ ok: true, value: { name: 'rod bore', valueMm: 15, tolMm: 0.3 } });
    // 4 in = 101.6 mm, 0.05 in = 1.27 mm (NIST SP 811 Appendix B, 25.4 mm per inch)
    expect(parseDimension('plate width:4in:0.05in')).toEqual({ ok: true, value: { name: 'plate width', valueMm: 101.6, tolMm: 1.27 } });
    expect(parseDimension(' Rod  bore : 15.2mm : 0.2 mm')).toEqual({ ok: true, value: { name: 'Rod bore', valueMm: 15.2, tolMm: 0.2 } });
    expect(parseDimension('thread:1/4":0')).toEqual({ ok: true, value: { name: 'thread', valueMm: 6.35, tolMm: 0 } });
  });

  it('parseDimension · no tolerance, colons in the name · tolerance 0; the colons kept', () => {
    expect(parseDimension('rod bore:15')).toEqual({ ok: true, value: { name: 'rod bore', valueMm: 15, tolMm: 0 } });
    expect(parseDimension('slot a:b:10:1')).toEqual({ ok: true, value: { name: 'slot a:b', valueMm: 10, tolMm: 1 } });
  });

  it.each([
    ['rod bore', /name:value:tolerance/],
    [':15:0.3', /Name the dimension/],
    ['rod bore:wide:0.3', /"wide" is not a length/],
    ['rod bore:15:loose', /"loose" is not a tolerance/],
    ['rod bore:15:-1', /"-1" is not a tolerance/],
    ['rod bore:0:0.1', /more than 0 mm/],
    ['rod bore:15:60', /over 50 mm/],
  ])('parseDimension · %j · refused with a message', (text, message) => {
    const r = parseDimension(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(message);
  });
});

describe('search query schema', () => {
  it('search query schema · a full query · normalised', () => {
    const q = searchQuerySchema.parse({
      q: '  battery plate ',
      body: 'korvel-kx8,halden-h6',
      mount: ['1/4"', 'rods-15-60'],
      category: 'power-batteries',
      material: 'petg',
      fit: '4.5in x 3in x 1in',
      dim: ['rod bore:15:0.3', 'plate width:4in:0.05in'],
      adaptable: 'yes',
      minRating: '3.5',
      sort: 'newest',
      page: '2',
      pageSize: '10',
    });
    expect(q).toEqual({
      q: 'battery plate',
      body: ['korvel-kx8', 'halden-h6'],
      mount: ['screw-1-4-20', 'rods-15-60'],
      category: ['power-batteries'],
      material: ['PETG'],
      fit: [114.3, 76.2, 25.4],
      dim: [
        { name: 'rod bore', valueMm: 15, tolMm: 0.3 },
        { name: 'plate width', valueMm: 101.6, tolMm: 1.27 },
      ],
      adaptable: true,
      minRating: 3.5,
      sort: 'newest',
      page: 2,
      pageSize: 10,
    });
  });

  it('search query schema · an empty query · defaults', () => {
    expect(searchQuerySchema.parse({})).toEqual({ body: [], mount: [], category: [], material: [], dim: [], sort: 'relevance', page: 1, pageSize: 20 });
    expect(searchQuerySchema.parse({ q: '   ', fit: '' }).q).toBeUndefined();
  });

  it('search query schema · bad values · one message per field', () => {
    const r = searchQuerySchema.safeParse({
      fit: '120x80',
      dim: 'bore',
      mount: 'bayonet',
      category: 'hats',
      material: 'wood',
      page: '0',
      pageSize: '500',
      sort: 'best',
      extra: '1',
    });
    expect(r.success).toBe(false);
    const fields = fieldErrors(r.error!);
    expect(fields.fit).toMatch(/three lengths/);
    expect(fields.dim).toMatch(/name:value:tolerance/);
    expect(fields.mount).toMatch(/Unknown mount standard "bayonet"/);
    expect(fields.category).toMatch(/Unknown category "hats"\. Choose one of: power-batteries/);
    expect(fields.material).toMatch(/Unknown material "wood"/);
    expect(fields.page).toMatch(/whole number from 1/);
    expect(fields.pageSize).toMatch(/1 to 100/);
    expect(fields.sort).toMatch(/relevance, newest or proven/);
    expect(fields._).toMatch(/Unknown search parameter "extra"/);
  });

  it('search query schema · lists by commas and repeats · split, blanks and duplicates dropped', () => {
    expect(splitList(['a,b', ' b ', '', 'c'])).toEqual(['a', 'b', 'c']);
    expect(splitList(undefined)).toEqual([]);
  });
});

describe('readQueryText', () => {
  it('readQueryText · plain words, mount names and trade phrases · groups: one per word, one per name or phrase, the last word a prefix', () => {
    expect(readQueryText('Battery plate for the KX-8 bracket')).toEqual({
      kind: 'plain',
      groups: [
        { kind: 'phrase', text: 'battery plate', tokens: [synonymToken('battery-plate')], alsoWord: false, last: false },
        { kind: 'word', text: 'kx-8', parts: ['kx', '8'], last: false },
        { kind: 'word', text: 'bracket', last: true },
      ],
    });
    expect(readQueryText('quarter inch riser')).toMatchObject({
      groups: [
        { kind: 'mount', mount: 'screw-1-4-20' },
        { kind: 'phrase', text: 'riser', alsoWord: true },
      ],
    });
    expect(readQueryText('clamp 1/4"')).toMatchObject({
      groups: [
        { kind: 'word', text: 'clamp', last: false },
        { kind: 'mount', text: '1/4in' },
      ],
    });
  });

  it('readQueryText · a number glued to its unit or apart · one word', () => {
    for (const q of ['15mm', '15 mm', '15-mm', '15 MM', '15 millimetres']) expect(normaliseQueryText(q)).toBe('15mm');
    for (const q of ['1/4in', '1/4 in', '1/4"', '1/4 inch', '1/4″']) expect(normaliseQueryText(q)).toBe('1/4in');
    expect(normaliseQueryText('3/8"')).toBe('3/8in');
    expect(normaliseQueryText('5-inch monitor')).toBe('5in monitor');
    // not a unit: "in" as a word after a number that is part of something else
    expect(normaliseQueryText('1/4-20 in a pinch')).toBe('1/4-20 in a pinch');
    expect(readQueryText('15mm rod')).toEqual(readQueryText('15 mm rod'));
    expect(readQueryText('15mm rod')).toMatchObject({ groups: [{ kind: 'mount', mount: 'rods-15-60' }] });
  });

  it('readQueryText · hyphens, spaces and plurals of trade phrases · read alike', () => {
    for (const q of ['v-style', 'V style', 'vstyle', 'V-STYLE'])
      expect(readQueryText(q)).toMatchObject({ groups: [{ kind: 'mount', mount: 'battery-v-style' }] });
    for (const q of ['cold shoe', 'cold-shoe', 'coldshoe', 'cold shoes', 'accessory shoe']) {
      expect(readQueryText(q)).toMatchObject({ groups: [{ tokens: expect.arrayContaining([synonymToken('accessory-shoe')]) }] });
    }
    for (const q of ['wireless video receiver', 'receiver', 'RX', 'receivers']) {
      expect(readQueryText(q)).toMatchObject({ groups: [{ tokens: [synonymToken('video-receiver')] }] });
    }
    for (const q of ['follow-focus gear', 'lens gear', 'focus gears']) {
      expect(readQueryText(q)).toMatchObject({ groups: [{ tokens: expect.arrayContaining([synonymToken('focus-gear')]) }] });
    }
  });

  it('readQueryText · query syntax · sent to the parser with mount names replaced', () => {
    for (const q of ['title:plate', '+korvel -tpu', 'plate~1', 'bracket^2', 'batt*', 'title:', '*~^']) expect(readQueryText(q).kind).toBe('syntax');
    expect(readQueryText('mounts:LWS')).toEqual({ kind: 'syntax', text: `mounts:${mountToken('rods-15-60')}` });
  });

  it('readQueryText · hyphens inside words, lone dashes, times · not taken for syntax', () => {
    for (const q of ['KX-8 v-mount', 'plate – korvel', 'plate - korvel', '1/4-20 riser', '16:9 hood']) expect(readQueryText(q).kind).toBe('plain');
  });

  it('readQueryText · blanks and stop words only · no text', () => {
    expect(readQueryText(undefined)).toEqual({ kind: 'none' });
    expect(readQueryText('  the  ')).toEqual({ kind: 'none' });
  });
});
