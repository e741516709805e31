import { describe, expect, it } from 'vitest';
import { displayName, modelFileName } from '../../server/modules/files/sniff';

describe('file names · display names', () => {
  // The characters are those Unicode UAX #9 §2 lists as explicit directional formatting (embeddings,
  // overrides, isolates) and implicit marks (LRM, RLM, ALM).
  it.each([
    ['invoice\u202Etxt.exe', 'invoicetxt.exe'],
    ['\u202Abracket\u202C.stl', 'bracket.stl'],
    ['\u2066plate\u2069\u2067.3mf\u2068', 'plate.3mf'],
    ['cage\u200E\u200F\u061C.stl', 'cage.stl'],
  ])('display names · %j · bidi controls stripped', (raw, shown) => {
    expect(displayName(raw)).toBe(shown);
  });

  it('display names · letters of right-to-left scripts · kept (they are not controls)', () => {
    expect(displayName('מתקן.stl')).toBe('מתקן.stl');
  });
});

describe('file names · model downloads keep their model extension', () => {
  it.each([
    ['bracket.stl', '.stl', 'bracket.stl'],
    ['BRACKET.STL', '.stl', 'BRACKET.STL'],
    ['invoicetxt.exe', '.stl', 'invoicetxt.exe.stl'],
    ['plate.stl', '.3mf', 'plate.3mf'],
    ['readme', '.3mf', 'readme.3mf'],
  ])('model downloads · %j as %s · saved as %j', (name, extension, saved) => {
    expect(modelFileName(name, extension)).toBe(saved);
  });

  it('model downloads · a long name · within the 200-character name column', () => {
    expect(modelFileName('a'.repeat(200), '.stl')).toHaveLength(200);
  });
});
