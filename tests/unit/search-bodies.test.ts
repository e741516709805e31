import { describe, expect, it } from 'vitest';
import { PhraseTable } from '@shared/search/aliases';
import { bodyPhraseEntries, bodyToken, resolveBody } from '@shared/search/bodies';

// invented bodies, as in the demo seeders
const BODIES = [
  { slug: 'korvel-kx8', maker: 'Korvel', model: 'KX-8', aliases: ['KX8', 'Korvel 8'] },
  { slug: 'korvel-kx4-mini', maker: 'Korvel', model: 'KX-4 Mini', aliases: ['KX4', 'KX Mini'] },
  { slug: 'halden-h6', maker: 'Halden Cine', model: 'H6', aliases: ['Halden 6', 'H-6'] },
];

describe('camera bodies · by name', () => {
  it.each(['korvel-kx8', 'KX8', 'kx-8', 'KX 8', 'Korvel KX-8', 'korvel kx8', 'Korvel 8', '  kx8 '])('camera bodies · %j · resolved to the KX-8', (value) => {
    expect(resolveBody(value, BODIES)).toEqual({ ok: true, slug: 'korvel-kx8' });
  });

  it('camera bodies · an unknown name · the closest known bodies named', () => {
    const found = resolveBody('KX88', BODIES);
    expect(found.ok).toBe(false);
    expect(!found.ok && found.closest[0]).toBe('Korvel KX-8');
    expect(!found.ok && found.closest.length).toBeLessThanOrEqual(3);
  });

  it('camera bodies · search text however spaced · body names read out of it', () => {
    const table = new PhraseTable(bodyPhraseEntries(BODIES));
    for (const text of ['plate for the kx-8', 'plate for the kx 8', 'plate for the korvel kx8']) {
      expect(table.find(text).mentions.map((m) => m.tokens)).toEqual([[bodyToken('korvel-kx8')]]);
    }
    expect(table.find('kx-4 mini cage').mentions.map((m) => m.tokens)).toEqual([[bodyToken('korvel-kx4-mini')]]);
    expect(table.find('kx80 cage').mentions).toEqual([]);
  });
});
