import lunr from 'lunr';
import { describe, expect, it } from 'vitest';
import { MOUNT_STANDARDS } from '@shared/catalogue';
import { expandMountAliases, mountIndexText, mountToken, resolveMount } from '@shared/search/aliases';

describe('mount aliases · expansion', () => {
  it.each([
    ['1/4"', 'screw-1-4-20'],
    ['1/4-20', 'screw-1-4-20'],
    ['quarter inch', 'screw-1-4-20'],
    ['Quarter-Inch', 'screw-1-4-20'],
    ['1/4 inch', 'screw-1-4-20'],
    ['1/4″', 'screw-1-4-20'],
    ['3/8-16', 'screw-3-8-16'],
    ['3/8"', 'screw-3-8-16'],
    ['15mm rods', 'rods-15-60'],
    ['LWS', 'rods-15-60'],
    ['15mm studio', 'rods-15-100'],
    ['19mm rods', 'rods-19-104'],
    ['v-mount', 'battery-v-style'],
    ['V mount', 'battery-v-style'],
    ['three stud', 'battery-3-stud'],
    ['cold shoe', 'accessory-shoe'],
    ['NATO rail', 'rail-1913'],
    ['quick release plate', 'dovetail-38'],
    ['0.8 mod', 'gear-0-8'],
    ['1/4-20 UNC screw', 'screw-1-4-20'],
  ])('mount aliases · %j · read as %s', (typed, slug) => {
    // aliases and labels from shared/catalogue.ts MOUNT_STANDARDS (common crew usage)
    const { mentions } = expandMountAliases(`riser ${typed} plate`);
    expect(mentions.map((m) => m.slug)).toEqual([slug]);
  });

  it('mount aliases · overlapping names · the longest first', () => {
    expect(expandMountAliases('15mm studio rods').mentions.map((m) => m.slug)).toEqual(['rods-15-100']);
    expect(expandMountAliases('15 mm studio rods at 100 mm').mentions.map((m) => m.slug)).toEqual(['rods-15-100']);
    expect(expandMountAliases('3/8-16 thread').mentions.map((m) => m.phrase)).toEqual(['3/8-16']);
  });

  it('mount aliases · words and inch marks · whole words only; an inch mark may run into the next word', () => {
    expect(expandMountAliases('glwsx').mentions).toEqual([]);
    expect(expandMountAliases('dovetailed').mentions).toEqual([]);
    // plurals are the same name
    expect(expandMountAliases('dovetails').mentions.map((m) => m.slug)).toEqual(['dovetail-38']);
    expect(expandMountAliases('1/4"plate').mentions.map((m) => m.slug)).toEqual(['screw-1-4-20']);
  });

  it('mount aliases · a query with other words · those kept, names replaced with tokens for query syntax', () => {
    const e = expandMountAliases('Riser for 1/4" and LWS');
    expect(e.rest).toBe('riser for and');
    expect(e.replaced).toBe(`riser for ${mountToken('screw-1-4-20')} and ${mountToken('rods-15-60')}`);
    expect(expandMountAliases('mounts:lws +v-mount').replaced).toBe(`mounts:${mountToken('rods-15-60')} +${mountToken('battery-v-style')}`);
  });

  it('mount aliases · the word "other" · never the "Other (see note)" mount', () => {
    expect(expandMountAliases('other clamp').mentions).toEqual([]);
    expect(resolveMount('other')).toBe('other'); // the slug itself still works as a filter
  });

  it('mount aliases · filter values · resolved from slugs, labels and aliases', () => {
    expect(resolveMount('screw-1-4-20')).toBe('screw-1-4-20');
    expect(resolveMount('1/4"')).toBe('screw-1-4-20');
    expect(resolveMount('LWS')).toBe('rods-15-60');
    expect(resolveMount('V-style battery plate')).toBe('battery-v-style');
    expect(resolveMount('half inch')).toBeNull();
  });
});

describe('mount aliases · tokens', () => {
  it('mount tokens · lunr indexing and search pipelines · survive unchanged', () => {
    for (const m of MOUNT_STANDARDS) {
      const token = mountToken(m.slug);
      const indexed = lunr(function () {
        this.ref('id');
        this.field('mounts');
        this.add({ id: '1', mounts: mountIndexText([{ slug: m.slug, note: 'see the photo' }]) });
      });
      expect(Object.keys((indexed as unknown as { invertedIndex: object }).invertedIndex)).toContain(token);
      expect(lunr.stemmer(new lunr.Token(token, {})).toString()).toBe(token);
      expect(lunr.tokenizer(token).map(String)).toEqual([token]);
    }
  });

  it('mount tokens · each standard · a distinct token', () => {
    const tokens = MOUNT_STANDARDS.map((m) => mountToken(m.slug));
    expect(new Set(tokens).size).toBe(tokens.length);
  });

  it('mount tokens · a document · label and note indexed next to the token', () => {
    expect(mountIndexText([{ slug: 'screw-1-4-20' }, { slug: 'other', note: 'Hirose 4-pin' }])).toBe(
      `${mountToken('screw-1-4-20')} 1/4-20 UNC screw ${mountToken('other')} Hirose 4-pin`,
    );
  });
});
