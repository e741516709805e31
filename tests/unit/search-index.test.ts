// The index builder and the searcher on documents held in memory (no database): ranking, typos,
// prefixes, mount names and query syntax. The API test covers the same through the real app.
import { describe, expect, it } from 'vitest';
import lunr from 'lunr';
import { searchQuerySchema, type SearchQueryInput } from '@shared/schemas/search';
import { AppError } from '../../server/errors';
import { buildIndex, indexFileContent, type SearchDocument } from '../../server/modules/search/index-builder';
import { Budget, createSearcher, readSyntax } from '../../server/modules/search/searcher';
import { allowedEditDistance } from '@shared/search/query';

let nextId = 1;
function doc(over: Partial<SearchDocument>): SearchDocument {
  const id = nextId++;
  return {
    id,
    slug: `part-${id}`,
    title: `Part ${id}`,
    summary: 'A printed part for the camera department.',
    description: '',
    category: 'rods-mounting',
    bodies: [],
    mounts: [],
    materials: ['PETG'],
    keyDimensions: [],
    sizeMm: null,
    thumbnail: null,
    licence: 'CC-BY-4.0',
    adaptable: true,
    publishedAt: new Date(Date.UTC(2025, 0, id)).toISOString(),
    publishedRevisionId: id,
    rating: null,
    ...over,
  };
}

const plate = doc({ title: 'V-style battery plate adapter', category: 'power-batteries', mounts: [{ slug: 'battery-v-style' }, { slug: 'screw-1-4-20' }] });
const note = doc({ title: 'Slate holder', description: 'Keeps the spare battery for the slate light in a pocket.' });
const riser = doc({ title: 'Cheese riser', mounts: [{ slug: 'screw-1-4-20' }] });
const kx8 = doc({ title: 'Top handle', bodies: [{ slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8', aliases: ['Korvel 8'] }] });
const clamp = doc({ title: 'Rod clamp', mounts: [{ slug: 'rods-15-60' }], keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }] });
const docs = [plate, note, riser, kx8, clamp];
const searcher = createSearcher({ index: buildIndex(docs), documents: docs });

const ids = (input: SearchQueryInput) => searcher.search(searchQuerySchema.parse(input)).results.map((r) => r.id);

describe('search index · ranking', () => {
  it('search index ranking · a title match and a description-only match · the title match first', () => {
    expect(ids({ q: 'battery' })).toEqual([plate.id, note.id]);
  });

  it('search index ranking · several words · parts matching every word first, then most words, never an empty page', () => {
    const res = searcher.search(searchQuerySchema.parse({ q: 'battery plate adapter slate' }));
    expect(res.results.map((r) => r.id)).toEqual([plate.id, note.id]);
    expect(res.results[0]).toMatchObject({ matched: ['battery plate', 'adapter'], missing: ['slate'] });
    expect(res.results[1]).toMatchObject({ matched: ['slate'], missing: ['battery plate', 'adapter'] });
    const all = searcher.search(searchQuerySchema.parse({ q: 'slate battery holder' }));
    expect(all.results[0]).toMatchObject({ id: note.id, matched: ['slate', 'battery', 'holder'], missing: [] });
    expect(all.results.map((r) => r.id)).toEqual([note.id, plate.id]);
    expect(ids({ q: 'battery zzzzqqq' })).toEqual([plate.id, note.id]);
  });

  it('search index ranking · a camera body by model, compact model or alias · found', () => {
    for (const q of ['KX-8', 'kx8', 'korvel 8', 'Korvel']) expect(ids({ q })).toEqual([kx8.id]);
  });

  it('search index ranking · typos in words the shelf does not know · forgiven', () => {
    // "baterry" is two edits from the stem "batteri": allowed from 7 letters
    expect(ids({ q: 'baterry' })).toEqual([plate.id, note.id]);
    expect(ids({ q: 'adaptr' })).toEqual([plate.id]);
    // known words are taken as typed: "slate" does not also find "plate"
    expect(ids({ q: 'slate' })).toEqual([note.id]);
  });

  it('search index ranking · the last word · taken as a prefix', () => {
    expect(ids({ q: 'chee' })).toEqual([riser.id]);
    // only the last word is a prefix: "batt" matches nothing here, "plate" still does
    expect(searcher.search(searchQuerySchema.parse({ q: 'batt plate' })).results).toMatchObject([{ id: plate.id, matched: ['plate'], missing: ['batt'] }]);
    expect(ids({ q: 'plate batt' })).toEqual([plate.id, note.id]);
  });

  it('search index ranking · mounts by any of their names · found', () => {
    for (const q of ['1/4"', 'quarter inch', '1/4-20', 'tripod screw']) expect(ids({ q }).sort()).toEqual([plate.id, riser.id].sort());
    expect(ids({ q: 'LWS clamp' })).toEqual([clamp.id]);
  });

  it('search index ranking · no text · everything, newest first', () => {
    expect(ids({})).toEqual([...docs].reverse().map((d) => d.id));
  });
});

describe('search index · query syntax', () => {
  it('search index query syntax · lunr syntax · run', () => {
    expect(ids({ q: 'title:battery' })).toEqual([plate.id]);
    expect(ids({ q: '+battery -adapter' })).toEqual([note.id]);
    expect(ids({ q: 'mounts:LWS' })).toEqual([clamp.id]);
  });

  it.each(['title:', '*~^', 'colour:red', 'plate~x'])('search index query syntax · %j · 400 explaining the syntax', (q) => {
    let caught: unknown;
    try {
      ids({ q });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(AppError);
    expect((caught as AppError).status).toBe(400);
    expect((caught as AppError).message).toMatch(/could not be read/);
    expect((caught as AppError).message).toMatch(/field:word/);
  });
});

describe('search index · file', () => {
  it('search index file · its JSON form · round-trips', () => {
    const content = JSON.parse(indexFileContent(docs, 'abc', buildIndex(docs)));
    const again = createSearcher({ index: lunr.Index.load(content.index), documents: content.documents });
    expect(again.search(searchQuerySchema.parse({ q: 'battery' })).results.map((r) => r.id)).toEqual([plate.id, note.id]);
    expect(content).toMatchObject({ format: 2, fingerprint: 'abc' });
  });
});

describe('search index · limits', () => {
  // The probe's queries: 12 letters at distance 7 held the event loop for half a minute before the cap.
  it.each(['abcdefghijkl~7', 'abcdefghijkl~6', 'abcdefghijklmnopqrstuvwxyzabcdefghij~2', 'plate~9 battery~9 riser~9'])(
    'search index limits · %j · answered within its limits',
    (q) => {
      expect(() => ids({ q })).not.toThrow();
    },
  );

  it('search index limits · an edit distance above 2 · read as 2', () => {
    expect(ids({ q: 'title:plaet~7' })).toEqual(ids({ q: 'title:plaet~2' }));
    expect(ids({ q: 'title:plaet~2' })).toContain(plate.id);
    expect(ids({ q: 'abcdefghijkl~7' })).toEqual([]);
    expect(ids({ q: 'abcdefghijkl~7 -battery' })).toEqual([]);
  });

  it('search index limits · long words · fewer edits', () => {
    expect(allowedEditDistance(7, 12)).toBe(2);
    expect(allowedEditDistance(2, 15)).toBe(1);
    expect(allowedEditDistance(2, 31)).toBe(0);
    expect(allowedEditDistance(-1, 5)).toBe(0);
  });

  it.each([
    ['*', /letters before a \*/],
    ['a*', /letters before a \*/],
    ['*late', /letters before a \*/],
    ['pl*te ba*t ri*', /3 wildcards/],
    [Array.from({ length: 13 }, (_, i) => `+w${i}`).join(' '), /13 words/],
  ])('refuses %j with a 400 that says what to change', (q, message) => {
    expect(() => readSyntax(q, q)).toThrow(message);
    try {
      ids({ q });
    } catch (err) {
      expect((err as AppError).status).toBe(400);
    }
  });

  it('search index limits · some letters typed, a required word with several expansions · "starts with" keeps working', () => {
    expect(ids({ q: 'title:ba*' })).toEqual([plate.id]);
    expect(ids({ q: '+ch* +riser' })).toEqual([riser.id]);
  });

  it('search index limits · a search past its budget · stopped with a 503', () => {
    const spent = new Budget(-1);
    expect(() => spent.check()).toThrow(/took too long/);
  });
});

describe('search index · plain-word scorer', () => {
  it('plain-word scorer · the same terms · the same scores as lunr.Index.query', () => {
    // reference: lunr 2.3.9's own query scoring over the same index, every term optional
    const index = buildIndex(docs);
    const ours = createSearcher({ index, documents: docs });
    for (const q of ['battery', 'battery holder', 'pocket light spare']) {
      const terms = q.split(' ');
      const reference = new Map(
        index.query((query) => terms.forEach((t) => query.term(t, { presence: lunr.Query.presence.OPTIONAL }))).map((r) => [Number(r.ref), r.score]),
      );
      const got = ours.search(searchQuerySchema.parse({ q: `${q} ` }));
      expect(got.results.length).toBeGreaterThan(0);
      for (const r of got.results) if (r.missing.length === 0 && reference.has(r.id)) expect(r.score).toBeCloseTo(reference.get(r.id)!, 3);
    }
  });
});
