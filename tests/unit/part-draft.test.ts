import { createPinia, setActivePinia } from 'pinia';
import { beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { loadPartSchemas, stepOfField, usePartDraftStore } from '@/stores/partDraft';
import { formatSizeIn, formatSizeMm } from '@/lib/format';

beforeAll(() => loadPartSchemas());
beforeEach(() => setActivePinia(createPinia()));

describe('part draft · server field keys', () => {
  it('part draft · keys of a 422 answer · belong to the step that shows the field', () => {
    expect(stepOfField('title')).toBe('details');
    expect(stepOfField('model')).toBe('files');
    expect(stepOfField('photo')).toBe('files');
    expect(stepOfField('mounts.1.note')).toBe('fit');
    expect(stepOfField('keyDimensions.0.valueMm')).toBe('fit');
    expect(stepOfField('recipes.0.layerMm')).toBe('recipes');
    expect(stepOfField('licence')).toBe('licence');
    expect(stepOfField('_')).toBe('review');
  });

  it('part draft · server messages on two steps · opens the earlier step and keeps both messages', () => {
    const draft = usePartDraftStore();
    const step = draft.takeServerErrors({ licence: 'Choose another licence.', 'recipes.0.layerMm': 'Too thick.' });
    expect(step).toBe('recipes');
    expect(draft.stepHasErrors('licence')).toBe(true);
    expect(draft.errors['recipes.0.layerMm']).toBe('Too thick.');
  });
});

describe('part draft · checking a step', () => {
  it('part draft · 0.36 mm layers on a 0.4 mm nozzle · the recipes step reports the shared rule', () => {
    const draft = usePartDraftStore();
    Object.assign(draft.recipes[0], { layerMm: 0.36, infillPct: 30, hotendC: 210, bedC: 60, speedMmS: 60 });
    expect(draft.checkStep('recipes')).toBe(false);
    // shared/schemas/recipe.ts: at most 80 % of the nozzle (common practice)
    expect(draft.errors['recipes.0.layerMm']).toContain('at most 0.32 mm');
    draft.recipes[0].layerMm = 0.2;
    draft.recheck();
    expect(draft.stepHasErrors('recipes')).toBe(false);
  });

  it('part draft · a key dimension typed in inches · is sent in millimetres', () => {
    const draft = usePartDraftStore();
    draft.keyDimensions.push({ ...draft.newKeyDimension(), name: 'rod bore', value: '5/8 in', tol: '0.1' });
    expect(draft.checkStep('fit')).toBe(true);
    // 5/8 in × 25.4 mm/in (exact since 1959) = 15.875 mm
    expect(draft.submission().keyDimensions[0]).toEqual({ name: 'rod bore', valueMm: 15.875, tolMm: 0.1 });
  });

  it('part draft · a length that is not one · gets a message saying how to write it', () => {
    const draft = usePartDraftStore();
    draft.keyDimensions.push({ ...draft.newKeyDimension(), name: 'rod bore', value: 'fifteen', tol: '' });
    expect(draft.checkStep('fit')).toBe(false);
    expect(draft.errors['keyDimensions.0.valueMm']).toContain('15 mm or 5/8 in');
  });

  it('part draft · adapting a CC BY-NC part under CC BY · refuses the licence with the reason', () => {
    const draft = usePartDraftStore();
    draft.setParent({ id: 9, licence: { id: 'CC-BY-NC-4.0' } } as Parameters<typeof draft.setParent>[0]);
    draft.licence = 'CC-BY-4.0';
    expect(draft.checkStep('licence')).toBe(false);
    expect(draft.errors.licence).toContain('non-commercial');
  });
});

function partOnShelf(over: Record<string, unknown> = {}) {
  return {
    id: 9,
    slug: 'rod-clamp',
    title: 'Rod clamp',
    summary: 'Holds a 15 mm rod',
    description: 'A clamp for 15 mm rods.',
    category: { slug: 'clamps' },
    compatibility: { bodies: [], mounts: [], keyDimensions: [] },
    recipes: [],
    files: [],
    licence: { id: 'CC-BY-4.0', adaptation: { allowed: true, allowedChildIds: ['CC-BY-4.0'], reason: '' } },
    safety: { carriesLoad: true, overhead: true, vehicle: false, heat: false, testedLoadKg: 1.2 },
    visibility: 'everyone',
    ...over,
  } as unknown as Parameters<ReturnType<typeof usePartDraftStore>['startAdapt']>[0];
}

describe('part draft · adapting a part', () => {
  it('part draft · adapting a part that carries 1.2 kg overhead · starts with no safety flag and no tested load', () => {
    const draft = usePartDraftStore();
    draft.startAdapt(partOnShelf());
    expect(draft.safety).toEqual({ carriesLoad: false, overhead: false, vehicle: false, heat: false });
    expect(draft.testedLoadKg).toBeNull();
    expect(draft.submission().safety.carriesLoad).toBe(false);
    expect(draft.submission().testedLoadKg).toBeNull();
  });

  it('part draft · adapting without confirming the safety step · the licence step asks the contributor to state it', () => {
    const draft = usePartDraftStore();
    draft.startAdapt(partOnShelf());
    expect(draft.checkStep('licence')).toBe(false);
    expect(draft.errors.safety).toContain('Nothing is copied from the original');
    draft.safetyStated = true;
    expect(draft.checkStep('licence')).toBe(true);
  });

  it('part draft · editing a part · keeps its stated flags and tested load', () => {
    const draft = usePartDraftStore();
    draft.startEdit(partOnShelf({ author: { id: 1 } }));
    expect(draft.safety.carriesLoad).toBe(true);
    expect(draft.testedLoadKg).toBe(1.2);
    expect(draft.checkStep('licence')).toBe(true);
  });
});

describe('part draft · kept between visits', () => {
  it('part draft · a snapshot put back on a fresh form · restores every field and the chosen files', () => {
    const first = usePartDraftStore();
    first.startAdapt(partOnShelf());
    first.title = 'Shorter rod clamp';
    first.keyDimensions.push({ ...first.newKeyDimension(), name: 'rod bore', value: '15.2', tol: '0.1' });
    first.recipes[0].infillPct = 35;
    first.safety.overhead = true;
    first.safetyStated = true;
    first.addFiles('source', [new File(['solid'], 'clamp.step', { type: 'application/octet-stream' })]);
    // IndexedDB stores a structured clone (Node's cannot clone a File; the browser's can)
    const taken = first.snapshot();
    const saved = { ...taken, fields: structuredClone(taken.fields) };

    setActivePinia(createPinia());
    const again = usePartDraftStore();
    again.startAdapt(partOnShelf());
    expect(again.title).toBe('Rod clamp');
    again.restore(saved);
    expect(again.title).toBe('Shorter rod clamp');
    expect(again.keyDimensions[0]).toMatchObject({ name: 'rod bore', value: '15.2', tol: '0.1' });
    expect(again.recipes[0].infillPct).toBe(35);
    expect(again.safety.overhead).toBe(true);
    expect(again.safetyStated).toBe(true);
    expect(again.sourceFiles.map((f) => f.file.name)).toEqual(['clamp.step']);
    expect(again.hasContent).toBe(true);
  });

  it('part draft · a blank new form · has nothing worth keeping', () => {
    const draft = usePartDraftStore();
    draft.reset('new');
    expect(draft.hasContent).toBe(false);
    draft.summary = 'x';
    expect(draft.hasContent).toBe(true);
  });
});

describe('format · sizes', () => {
  it('format · a 20 × 30 × 10 mm box · reads in mm and in inches (25.4 mm per inch)', () => {
    expect(formatSizeMm([20, 30, 10])).toBe('20 × 30 × 10 mm');
    expect(formatSizeIn([20, 30, 10])).toBe('0.79 × 1.18 × 0.39 in');
    expect(formatSizeMm([15.875, 0.254, 100.04])).toBe('15.9 × 0.25 × 100 mm');
  });
});
