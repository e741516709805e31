import Papa from 'papaparse';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { KitDetail, KitSummaryResponse } from '@shared/api/planning';
import type { Role } from '@shared/types';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { seedBodies, setReadyRecipe, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number; email: string };
let owner: Agent;
let editor: Agent;
let reader: Agent;
let stranger: Agent;
let moderator: Agent;

/** A solid PLA recipe: the estimate of a 20 mm cube is then its whole volume. */
const solidPla = { ...setReadyRecipe, material: 'PLA', hotendC: 210, bedC: 60, infillPct: 100 } as const;
const solidPlaFigures = { material: 'PLA', nozzleMm: 0.4, layerMm: 0.2, walls: 2, topBottomLayers: 4, infillPct: 100 };

let cubePart: number;
let cubeRecipe: number;
let cubeModel: number;
let cubePhoto: number;
let longPart: number;
let otherRecipe: number;
let draftPart: number;
let draftModel: number;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id, email: u.email });
}

async function submitted(data: unknown, model: Buffer, photo?: Buffer): Promise<number> {
  let req = moderator.post('/api/parts').field('data', JSON.stringify(data)).attach('model', model, 'part.stl');
  if (photo) req = req.attach('photo', photo, 'part.png');
  const res = await req;
  expect(res.status).toBe(201);
  return res.body.id;
}

async function published(data: unknown, model: Buffer, photo?: Buffer): Promise<number> {
  // submitted by one member, approved by a moderator (the review desk's four eyes)
  const author = await signedIn();
  let req = author.post('/api/parts').field('data', JSON.stringify(data)).attach('model', model, 'part.stl');
  if (photo) req = req.attach('photo', photo, 'part.png');
  const res = await req;
  expect(res.status).toBe(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return res.body.id;
}

async function detail(partId: number) {
  return (await moderator.get(`/api/parts/${partId}`).expect(200)).body as {
    recipes: { id: number; material: string }[];
    files: { id: number; kind: string }[];
  };
}

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  [owner, editor, reader, stranger, moderator] = await Promise.all([signedIn(), signedIn(), signedIn(), signedIn(), signedIn('moderator')]);

  cubePart = await published(submission({ title: 'Solid test cube', recipes: [solidPla] }), boxStl(20, 20, 20), await plainPng());
  await t.services.parts.photosSettled();
  const cube = await detail(cubePart);
  cubeRecipe = cube.recipes[0].id;
  cubeModel = cube.files.find((f) => f.kind === 'model')!.id;
  cubePhoto = cube.files.find((f) => f.kind === 'photo')!.id;

  longPart = await published(
    submission({ title: 'Long rod cover', safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false }, testedLoadKg: null }),
    boxStl(240, 20, 20),
  );
  const other = await published(submission({ title: 'Another part' }), boxStl(10, 10, 10));
  otherRecipe = (await detail(other)).recipes[0].id;

  draftPart = await submitted(submission({ title: 'Draft bracket' }), boxStl(30, 30, 5));
  draftModel = (await detail(draftPart)).files.find((f) => f.kind === 'model')!.id;
});
afterAll(async () => {
  await t.close();
});

describe('planning · estimate', () => {
  it('estimate · a published model file, solid PLA · weighs the 20 mm cube at 9.92 g', async () => {
    // Trade reference: PLA 1.24 g/cm³ (UL Prospector, ISO 1183): 8 cm³ × 1.24 = 9.92 g; at 100 % infill
    // walls + skins + infill fill every layer exactly once, so nothing is counted twice.
    const visitor = await agentFor(t.app);
    const res = await visitor.post('/api/estimate').send({ fileId: cubeModel, ...solidPlaFigures });
    expect(res.status).toBe(200);
    expect(res.body.massG).toBeCloseTo(9.92, 6);
    expect(res.body.volumeMm3).toBeCloseTo(8000, 3);
    // L = m / (ρ·π·(d/2)²): 8000 mm³ / (π·0.875²) = 3326.0 mm of 1.75 mm filament
    expect(res.body.lengthM['1.75']).toBeCloseTo(8000 / (Math.PI * 0.875 ** 2) / 1000, 6);
    expect(res.body.lengthM['2.85']).toBeCloseTo(8000 / (Math.PI * 1.425 ** 2) / 1000, 6);
    expect(res.body.timeMin).toBeGreaterThan(0);
    // default PLA price 20 per kg (shared/estimate.ts): 9.92 g → 0.1984
    expect(res.body.cost).toBeCloseTo(0.1984, 6);
    expect(res.body.geometry).toMatchObject({ source: 'file', fileId: cubeModel, partId: cubePart, sizeMm: [20, 20, 20] });
    expect(res.body.assumptions.length).toBeGreaterThan(3);
    expect(res.body.method).toBe('slices');
    expect(res.body.assumptions.join(' ')).toMatch(/Sliced from the mesh: 100 layers of 0\.2 mm/);
  });

  it('estimate · the cube file at 2 walls, 4 top/bottom, 20 % · sliced layers give the hand-worked split', async () => {
    // d = 2 × 0.45 mm: walls (20² − 18.2²) × 20 = 1375.2 mm³, skins 8 × 0.2 × 18.2² = 529.984 mm³,
    // infill 0.2 × 92 × 0.2 × 18.2² = 1218.9632 mm³ (the same hand computation as the unit tests).
    const res = await stranger.post('/api/estimate').send({ fileId: cubeModel, ...solidPlaFigures, infillPct: 20, walls: 2, topBottomLayers: 4 });
    expect(res.status).toBe(200);
    expect(res.body.method).toBe('slices');
    expect(res.body.partsMm3.walls).toBeCloseTo(1375.2, 0);
    expect(res.body.partsMm3.skins).toBeCloseTo(529.984, 0);
    expect(res.body.partsMm3.infill).toBeCloseTo(1218.9632, 0);
    const quick = await stranger
      .post('/api/estimate')
      .send({ volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20], ...solidPlaFigures, infillPct: 20, walls: 2, topBottomLayers: 4 });
    expect(quick.body.method).toBe('figures');
    expect(quick.body.massG).toBeCloseTo(res.body.massG, 3); // a cube is the prism the quick estimate assumes
  });

  it('estimate · acceleration and travel speed · slower acceleration never prints faster; out of range is 422', async () => {
    const figures = { volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20], ...solidPlaFigures, infillPct: 20 };
    const slow = await stranger.post('/api/estimate').send({ ...figures, accelerationMmS2: 300 });
    const fast = await stranger.post('/api/estimate').send({ ...figures, accelerationMmS2: 3000 });
    expect(slow.body.timeMin).toBeGreaterThan(fast.body.timeMin);
    const bad = await stranger.post('/api/estimate').send({ ...figures, travelSpeedMmS: 0 });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.travelSpeedMmS).toMatch(/between 5 and 1,000 mm\/s/);
  });

  it('estimate · raw figures · gives the same answer without a file', async () => {
    const res = await stranger.post('/api/estimate').send({ volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20], ...solidPlaFigures });
    expect(res.status).toBe(200);
    expect(res.body.massG).toBeCloseTo(9.92, 9);
    expect(res.body.geometry).toMatchObject({ source: 'figures', fileId: null });
  });

  it('estimate · watts and a price per kWh · adds electricity', async () => {
    const res = await stranger
      .post('/api/estimate')
      .send({ volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20], ...solidPlaFigures, printerWatts: 120, pricePerKwh: 0.3 });
    expect(res.body.cost).toBeCloseTo(0.1984 + ((120 * (res.body.timeMin / 60)) / 1000) * 0.3, 9);
  });

  it('estimate · a draft part’s file · 404 to others, 200 to a moderator', async () => {
    expect((await stranger.post('/api/estimate').send({ fileId: draftModel, ...solidPlaFigures })).status).toBe(404);
    expect((await moderator.post('/api/estimate').send({ fileId: draftModel, ...solidPlaFigures })).status).toBe(200);
    expect((await stranger.post('/api/estimate').send({ fileId: 999_999, ...solidPlaFigures })).status).toBe(404);
  });

  it('estimate · a photo instead of a model · 422 naming the file', async () => {
    const res = await stranger.post('/api/estimate').send({ fileId: cubePhoto, ...solidPlaFigures });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.fileId).toMatch(/photo, not a model/);
  });

  it('estimate · both a file and figures, or neither, or a layer too thick · 422', async () => {
    const both = await stranger.post('/api/estimate').send({ fileId: cubeModel, volumeMm3: 8000, areaMm2: 2400, sizeMm: [20, 20, 20], ...solidPlaFigures });
    expect(both.status).toBe(422);
    expect(both.body.error.fields.fileId).toMatch(/not both/);
    const neither = await stranger.post('/api/estimate').send(solidPlaFigures);
    expect(neither.body.error.fields.fileId).toMatch(/Choose a model file/);
    const partial = await stranger.post('/api/estimate').send({ volumeMm3: 8000, ...solidPlaFigures });
    expect(partial.body.error.fields.areaMm2).toMatch(/together/);
    const thick = await stranger.post('/api/estimate').send({ fileId: cubeModel, ...solidPlaFigures, layerMm: 0.4 });
    expect(thick.status).toBe(422);
    expect(thick.body.error.fields.layerMm).toMatch(/too thick/);
  });
});

describe('planning · filament prices', () => {
  it('prices · a member who set none · gets the defaults', async () => {
    const res = await editor.get('/api/me/prices');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ prices: { PLA: 20, PETG: 22 }, defaults: { PLA: 20 }, custom: [], pricePerKwh: null, currency: 'EUR', updatedAt: null });
  });

  it('prices · PUT replaces the sheet · own prices win, the rest stay default, and the estimate uses them', async () => {
    const put = await editor.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', editor.token)
      .send({ prices: { PLA: 30, ASA: 31.5 }, pricePerKwh: 0.3 });
    expect(put.status).toBe(200);
    expect(put.body).toMatchObject({ prices: { PLA: 30, ASA: 31.5, PETG: 22 }, custom: ['PLA', 'ASA'], pricePerKwh: 0.3 });
    const estimate = await editor.post('/api/estimate').send({ fileId: cubeModel, ...solidPlaFigures });
    expect(estimate.body.cost).toBeCloseTo((9.92 / 1000) * 30, 6);
    expect(estimate.body.assumptions.join(' ')).toMatch(/your price sheet/);
    const cleared = await editor.agent.put('/api/me/prices').set('X-CSRF-Token', editor.token).send({ prices: {} });
    expect(cleared.body).toMatchObject({ prices: { PLA: 20 }, custom: [], pricePerKwh: null });
  });

  it('prices · an unknown material or a negative price · 422; visitors 401', async () => {
    const unknown = await editor.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', editor.token)
      .send({ prices: { WOOD: 3 } });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.fields['prices.WOOD']).toMatch(/not a material/);
    const negative = await editor.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', editor.token)
      .send({ prices: { PLA: -1 } });
    expect(negative.body.error.fields['prices.PLA']).toMatch(/cannot be negative/);
    expect((await request(t.app).get('/api/me/prices')).status).toBe(401);
  });

  it('prices · a currency typed in lower case · is kept as its ISO 4217 code; an unknown code: 422', async () => {
    const gbp = await editor.agent.put('/api/me/prices').set('X-CSRF-Token', editor.token).send({ prices: {}, currency: 'gbp' });
    expect(gbp.status).toBe(200);
    expect(gbp.body.currency).toBe('GBP');
    // leaving the currency out keeps the one chosen
    const again = await editor.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', editor.token)
      .send({ prices: { PLA: 24 } });
    expect(again.body.currency).toBe('GBP');
    const bad = await editor.agent.put('/api/me/prices').set('X-CSRF-Token', editor.token).send({ prices: {}, currency: 'XQQ' });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.currency).toMatch(/three-letter code/);
    await editor.agent.put('/api/me/prices').set('X-CSRF-Token', editor.token).send({ prices: {}, currency: 'EUR' }).expect(200);
  });
});

describe('planning · printers', () => {
  it('printers · create, list, change, delete · only for the owner', async () => {
    const created = await stranger
      .post('/api/printers')
      .send({ name: 'Bench printer', bedMm: [180, 180, 180], nozzleMm: 0.4, watts: 90, notes: 'By the window' });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ name: 'Bench printer', bedMm: [180, 180, 180], bedMarginMm: 5, nozzleMm: 0.4, watts: 90, notes: 'By the window' });
    const id = created.body.id;
    expect((await stranger.get('/api/printers')).body.items.map((p: { id: number }) => p.id)).toContain(id);
    expect((await owner.get('/api/printers')).body.items.map((p: { id: number }) => p.id)).not.toContain(id);

    expect((await owner.get(`/api/printers/${id}`)).status).toBe(404);
    expect((await owner.patch(`/api/printers/${id}`).send({ name: 'Mine now' })).status).toBe(404);
    expect((await owner.delete(`/api/printers/${id}`)).status).toBe(404);

    const patched = await stranger.patch(`/api/printers/${id}`).send({ name: 'Bench printer v2', watts: null });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ name: 'Bench printer v2', watts: null, bedMm: [180, 180, 180] });
    expect((await stranger.delete(`/api/printers/${id}`)).status).toBe(204);
    expect((await stranger.get(`/api/printers/${id}`)).status).toBe(404);
  });

  it('printers · brim margin · 5 mm a side unless set, changeable, and a negative one refused', async () => {
    const created = await stranger
      .post('/api/printers')
      .send({ name: 'Margin printer', bedMm: [200, 200, 200], nozzleMm: 0.4, bedMarginMm: 8 })
      .expect(201);
    expect(created.body.bedMarginMm).toBe(8);
    const patched = await stranger.patch(`/api/printers/${created.body.id}`).send({ bedMarginMm: 0 }).expect(200);
    expect(patched.body.bedMarginMm).toBe(0);
    const bad = await stranger.post('/api/printers').send({ name: 'Bad margin', bedMm: [200, 200, 200], nozzleMm: 0.4, bedMarginMm: -1 });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.bedMarginMm).toMatch(/cannot be negative/);
  });

  it('printers · bad sizes, an empty change, visitors · 422 and 401', async () => {
    const bad = await stranger.post('/api/printers').send({ name: 'Broken', bedMm: [0, 200], nozzleMm: 0.4 });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.bedMm ?? bad.body.error.fields['bedMm.0']).toBeTruthy();
    const created = await stranger
      .post('/api/printers')
      .send({ name: 'Spare', bedMm: [200, 200, 200], nozzleMm: 0.6 })
      .expect(201);
    expect((await stranger.patch(`/api/printers/${created.body.id}`).send({})).status).toBe(422);
    expect((await request(t.app).get('/api/printers')).status).toBe(401);
  });
});

describe('planning · kits and sharing', () => {
  let kitId: number;

  it('planning · kits · create with defaults, refuse bad dates and an unknown heat', async () => {
    const res = await owner.post('/api/kits').send({
      name: 'Harbour Lights — splinter unit',
      production: 'Harbour Lights',
      startsOn: '2026-05-04',
      endsOn: '2026-05-08',
      heatExposure: 'outdoor-sun',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ access: 'owner', printHoursPerDay: 8, heatExposure: 'outdoor-sun', items: [], shares: [], owner: { id: owner.userId } });
    kitId = res.body.id;
    const dates = await owner.post('/api/kits').send({ name: 'Backwards', startsOn: '2026-05-08', endsOn: '2026-05-04' });
    expect(dates.status).toBe(422);
    expect(dates.body.error.fields.endsOn).toMatch(/before the first/);
    const heat = await owner.post('/api/kits').send({ name: 'Lava', heatExposure: 'volcano' });
    expect(heat.body.error.fields.heatExposure).toMatch(/vehicle-sun/);
    const patchDates = await owner.patch(`/api/kits/${kitId}`).send({ endsOn: '2026-05-01' });
    expect(patchDates.status).toBe(422);
  });

  it('kits · sharing with an unknown or a suspended account · the same neutral 422, naming no account', async () => {
    const share = (entry: Record<string, unknown>) =>
      owner.agent
        .put(`/api/kits/${kitId}/shares`)
        .set('X-CSRF-Token', owner.token)
        .send({ shares: [{ ...entry, access: 'read' }] });
    const suspended = await makeUser('member', { status: 'suspended' });
    const unknown = await share({ email: 'nobody-here@crew.test' });
    const gone = await share({ email: suspended.email });
    expect(unknown.status).toBe(422);
    expect(gone.status).toBe(422);
    // the same words for both, apart from the address the owner typed
    const unknownText = unknown.body.error.fields['shares.0.email'].replace('nobody-here@crew.test', '<address>');
    const goneText = gone.body.error.fields['shares.0.email'].replace(suspended.email, '<address>');
    expect(goneText).toBe(unknownText);
    expect(gone.body.error.message.replace(suspended.email, '<address>')).toBe(unknown.body.error.message.replace('nobody-here@crew.test', '<address>'));
    expect(JSON.stringify(gone.body)).not.toContain(suspended.user.displayName);
    expect(JSON.stringify(gone.body)).not.toMatch(/suspended/i);
    // by id too
    const noId = await share({ userId: 987654 });
    const goneId = await share({ userId: suspended.user.id });
    expect(goneId.body.error.fields['shares.0.userId'].replace(String(suspended.user.id), '<id>')).toBe(
      noId.body.error.fields['shares.0.userId'].replace('987654', '<id>'),
    );
    const self = await owner.agent
      .put(`/api/kits/${kitId}/shares`)
      .set('X-CSRF-Token', owner.token)
      .send({ shares: [{ userId: owner.userId, access: 'edit' }] });
    expect(self.body.error.fields['shares.0.userId']).toMatch(/you own this kit/);
  });

  it('kits · shared by e-mail and by id · the owner sees addresses, others only names', async () => {
    const res = await owner.agent
      .put(`/api/kits/${kitId}/shares`)
      .set('X-CSRF-Token', owner.token)
      .send({
        shares: [
          { email: editor.email.toUpperCase(), access: 'edit' },
          { userId: reader.userId, access: 'read' },
        ],
      });
    expect(res.status).toBe(200);
    expect(res.body.shares).toHaveLength(2);
    expect(res.body.shares.find((s: { access: string }) => s.access === 'edit').user).toMatchObject({ id: editor.userId, email: editor.email });
    const seenByReader = (await reader.get(`/api/kits/${kitId}`)).body as KitDetail;
    expect(seenByReader.access).toBe('read');
    expect(seenByReader.shares.every((s) => s.user.email === null)).toBe(true);
  });

  it('kits · who may look · owner, edit and read members yes; strangers 404; visitors 401', async () => {
    expect((await owner.get(`/api/kits/${kitId}`)).body.access).toBe('owner');
    expect((await editor.get(`/api/kits/${kitId}`)).body.access).toBe('edit');
    expect((await reader.get(`/api/kits/${kitId}`)).status).toBe(200);
    expect((await stranger.get(`/api/kits/${kitId}`)).status).toBe(404);
    expect((await moderator.get(`/api/kits/${kitId}`)).status).toBe(404);
    expect((await request(t.app).get(`/api/kits/${kitId}`)).status).toBe(401);
    expect((await reader.get('/api/kits')).body.items.find((k: { id: number }) => k.id === kitId)).toMatchObject({
      access: 'read',
      owner: { id: owner.userId },
    });
    expect((await stranger.get('/api/kits')).body.items.some((k: { id: number }) => k.id === kitId)).toBe(false);
    expect((await stranger.get(`/api/kits/${kitId}/summary`)).status).toBe(404);
    expect((await reader.get(`/api/kits/${kitId}/summary`)).status).toBe(200);
  });

  it('kits · who may change · edit members change the kit and items; read members 403; only the owner shares and deletes', async () => {
    const edited = await editor.patch(`/api/kits/${kitId}`).send({ locationNotes: 'Pier 4, wind from the sea', printHoursPerDay: 10 });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ locationNotes: 'Pier 4, wind from the sea', printHoursPerDay: 10, access: 'edit' });
    const refused = await reader.patch(`/api/kits/${kitId}`).send({ name: 'Renamed' });
    expect(refused.status).toBe(403);
    expect(refused.body.error.message).toMatch(/edit access/);
    expect((await stranger.patch(`/api/kits/${kitId}`).send({ name: 'Renamed' })).status).toBe(404);

    const added = await editor.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, quantity: 2 });
    expect(added.status).toBe(201);
    expect(added.body).toMatchObject({
      quantity: 2,
      part: { id: cubePart, onShelf: true },
      recipe: { id: cubeRecipe, current: true },
      material: 'PLA',
      printer: null,
    });
    expect((await reader.post(`/api/kits/${kitId}/items`).send({ partId: cubePart })).status).toBe(403);
    expect((await stranger.post(`/api/kits/${kitId}/items`).send({ partId: cubePart })).status).toBe(404);
    expect((await reader.patch(`/api/kits/${kitId}/items/${added.body.id}`).send({ quantity: 3 })).status).toBe(403);
    expect((await reader.delete(`/api/kits/${kitId}/items/${added.body.id}`)).status).toBe(403);

    const changed = await editor.patch(`/api/kits/${kitId}/items/${added.body.id}`).send({ quantity: 5, material: 'PETG' });
    expect(changed.body).toMatchObject({ quantity: 5, materialOverride: 'PETG', material: 'PETG' });
    expect((await editor.delete(`/api/kits/${kitId}/items/${added.body.id}`)).status).toBe(204);
    expect((await editor.delete(`/api/kits/${kitId}/items/${added.body.id}`)).status).toBe(404);

    const share = await editor.agent.put(`/api/kits/${kitId}/shares`).set('X-CSRF-Token', editor.token).send({ shares: [] });
    expect(share.status).toBe(403);
    expect(share.body.error.message).toMatch(/owner/);
    expect((await reader.agent.put(`/api/kits/${kitId}/shares`).set('X-CSRF-Token', reader.token).send({ shares: [] })).status).toBe(403);
    expect((await stranger.agent.put(`/api/kits/${kitId}/shares`).set('X-CSRF-Token', stranger.token).send({ shares: [] })).status).toBe(404);
    const visitor = await agentFor(t.app);
    expect((await visitor.agent.put(`/api/kits/${kitId}/shares`).set('X-CSRF-Token', visitor.token).send({ shares: [] })).status).toBe(401);
    expect((await editor.delete(`/api/kits/${kitId}`)).status).toBe(403);
    expect((await reader.delete(`/api/kits/${kitId}`)).status).toBe(403);
  });

  it('kits · the owner deletes · gone for everyone', async () => {
    expect((await owner.delete(`/api/kits/${kitId}`)).status).toBe(204);
    expect((await owner.get(`/api/kits/${kitId}`)).status).toBe(404);
    expect((await reader.get('/api/kits')).body.items.some((k: { id: number }) => k.id === kitId)).toBe(false);
  });
});

describe('planning · kit items', () => {
  let kitId: number;
  let ownPrinter: number;
  let editorsPrinter: number;

  beforeAll(async () => {
    kitId = (await owner.post('/api/kits').send({ name: 'Item checks' }).expect(201)).body.id;
    await owner.agent
      .put(`/api/kits/${kitId}/shares`)
      .set('X-CSRF-Token', owner.token)
      .send({ shares: [{ userId: editor.userId, access: 'edit' }] })
      .expect(200);
    ownPrinter = (
      await owner
        .post('/api/printers')
        .send({ name: 'Owner printer', bedMm: [220, 220, 250], nozzleMm: 0.4 })
        .expect(201)
    ).body.id;
    editorsPrinter = (
      await editor
        .post('/api/printers')
        .send({ name: 'Editor printer', bedMm: [220, 220, 250], nozzleMm: 0.4 })
        .expect(201)
    ).body.id;
  });

  it('items · a part that is not on the shelf · 422', async () => {
    const res = await owner.post(`/api/kits/${kitId}/items`).send({ partId: draftPart });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.partId).toMatch(/on the shelf/);
    expect((await owner.post(`/api/kits/${kitId}/items`).send({ partId: 999_999 })).body.error.fields.partId).toMatch(/on the shelf/);
  });

  it('items · a recipe of another part · 422', async () => {
    const res = await owner.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, recipeId: otherRecipe });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.recipeId).toMatch(/not one of this part/);
  });

  it('items · a printer of another member · 422, even for an edit member adding their own', async () => {
    const res = await editor.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, printerId: editorsPrinter });
    expect(res.status).toBe(422);
    expect(res.body.error.fields.printerId).toMatch(/kit owner’s printers/);
    const ok = await editor.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, printerId: ownPrinter });
    expect(ok.status).toBe(201);
    expect(ok.body.printer).toEqual({ id: ownPrinter, name: 'Owner printer' });
    const moved = await editor.patch(`/api/kits/${kitId}/items/${ok.body.id}`).send({ printerId: editorsPrinter });
    expect(moved.status).toBe(422);
  });

  it('items · quantity outside 1–100 or a negative price · 422', async () => {
    for (const quantity of [0, 101, 2.5]) {
      const res = await owner.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, quantity });
      expect(res.status).toBe(422);
      expect(res.body.error.fields.quantity).toBeTruthy();
    }
    expect((await owner.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, boughtPriceEach: -2 })).body.error.fields.boughtPriceEach).toMatch(
      /negative/,
    );
  });

  it('items · an item of another kit · 404', async () => {
    const otherKit = (await stranger.post('/api/kits').send({ name: 'Someone else' }).expect(201)).body.id;
    const theirs = (await stranger.post(`/api/kits/${otherKit}/items`).send({ partId: cubePart }).expect(201)).body.id;
    expect((await owner.patch(`/api/kits/${kitId}/items/${theirs}`).send({ quantity: 2 })).status).toBe(404);
  });

  it('items · the same Idempotency-Key sent twice (the first answer was lost) · one item added, both answers name it; a malformed key 422', async () => {
    const count = async () => ((await owner.get(`/api/kits/${kitId}`)).body as KitDetail).items.length;
    const before = await count();
    const key = 'kit-item-retry-0001';
    const first = await owner.post(`/api/kits/${kitId}/items`).set('Idempotency-Key', key).send({ partId: cubePart, quantity: 3 }).expect(201);
    const again = await owner.post(`/api/kits/${kitId}/items`).set('Idempotency-Key', key).send({ partId: cubePart, quantity: 3 }).expect(201);
    expect(again.body.id).toBe(first.body.id);
    expect(await count()).toBe(before + 1);
    const bad = await owner.post(`/api/kits/${kitId}/items`).set('Idempotency-Key', 'no').send({ partId: cubePart });
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.idempotencyKey).toMatch(/8 to 64/);
  });

  it('items · a deleted printer · leaves its items with no printer', async () => {
    const spare = (
      await owner
        .post('/api/printers')
        .send({ name: 'Spare', bedMm: [200, 200, 200], nozzleMm: 0.4 })
        .expect(201)
    ).body.id;
    const item = (await owner.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, printerId: spare }).expect(201)).body.id;
    await owner.delete(`/api/printers/${spare}`).expect(204);
    const kit = (await owner.get(`/api/kits/${kitId}`)).body as KitDetail;
    expect(kit.items.find((i) => i.id === item)!.printer).toBeNull();
  });
});

describe('planning · summary and export', () => {
  let kitId: number;
  let summary: KitSummaryResponse;

  beforeAll(async () => {
    // two set reports of PLA deforming in heat make an outcome warning on the cube part
    for (const a of [reader, stranger]) {
      await a
        .post(`/api/parts/${cubePart}/reports`)
        .field('data', JSON.stringify({ production: 'Harbour Lights', daysInUse: 3, conditions: ['heat', 'vehicle'], material: 'PLA', outcome: 'deformed' }))
        .expect(201);
    }
    await owner.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', owner.token)
      .send({ prices: { PLA: 25 }, pricePerKwh: 0.3, currency: 'CHF' })
      .expect(200);
    const cart = (
      await owner
        .post('/api/printers')
        .send({ name: 'Cart printer', bedMm: [220, 220, 250], nozzleMm: 0.4, watts: 120 })
        .expect(201)
    ).body.id;
    const mini = (
      await owner
        .post('/api/printers')
        .send({ name: 'Mini', bedMm: [100, 100, 100], nozzleMm: 0.4 })
        .expect(201)
    ).body.id;
    const sneaky = (
      await owner
        .post('/api/printers')
        .send({ name: '=HYPERLINK("http://evil.test","x")', bedMm: [220, 220, 250], nozzleMm: 0.4 })
        .expect(201)
    ).body.id;
    const kit = await owner
      .post('/api/kits')
      .send({ name: 'Salt Flats / "car" unit; rm -rf', production: 'Salt Flats', heatExposure: 'vehicle-sun', printerPrice: 300 })
      .expect(201);
    kitId = kit.body.id;
    await owner.agent
      .put(`/api/kits/${kitId}/shares`)
      .set('X-CSRF-Token', owner.token)
      .send({ shares: [{ userId: reader.userId, access: 'read' }] })
      .expect(200);
    const add = (body: object) => owner.post(`/api/kits/${kitId}/items`).send(body).expect(201);
    await add({ partId: cubePart, quantity: 3, printerId: cart, boughtPriceEach: 4 });
    await add({ partId: longPart, quantity: 2, printerId: cart });
    await add({ partId: longPart, quantity: 1, printerId: mini });
    await add({ partId: cubePart, quantity: 1, material: 'ASA', printerId: sneaky });
    summary = (await reader.get(`/api/kits/${kitId}/summary`).expect(200)).body;
  });

  it('summary · a kit read by a member it is shared with · is in the owner’s currency', () => {
    expect(summary.currency).toBe('CHF');
  });

  it('summary · PLA on a car rig in sun · heat warning naming a safer material; the ASA copy passes', () => {
    expect(summary.kit.heatExposure).toMatchObject({ id: 'vehicle-sun', temperatureC: 69.4 });
    const [pla, , , asa] = summary.items;
    expect(pla).toMatchObject({ material: 'PLA', quantity: 3, part: { id: cubePart } });
    expect(pla.heat).toMatchObject({ ok: false, marginC: -14.4 });
    expect(pla.heat!.message).toMatch(/ASA/);
    expect(asa.material).toBe('ASA');
    expect(asa.heat!.ok).toBe(true);
  });

  it('summary · bed fit · as-is, rotated on the cart printer, no on the mini', () => {
    expect(summary.items[0].fit!.fits).toBe('as-is');
    // stood up: 20 × 20 mm on the bed, 240 mm tall (STL stores float32, so within a thousandth)
    expect(summary.items[1].fit!.fits).toBe('rotated');
    summary.items[1].fit!.orientation!.forEach((side, i) => expect(side).toBeCloseTo([20, 20, 240][i], 2));
    expect(summary.items[2].fit!.fits).toBe('no');
    expect(summary.items[2].fit!.message).toMatch(/Too big/);
  });

  it('summary · evidence and cautions · set-report warnings and load cautions come with the item', () => {
    const [pla, long] = summary.items;
    expect(pla.evidenceWarnings).toContainEqual({ material: 'PLA', matchesMaterial: true, text: 'PLA deformed in heat in 2 of 2 reports' });
    expect(summary.items[3].evidenceWarnings.every((w) => !w.matchesMaterial)).toBe(true);
    expect(pla.cautions.map((c) => c.text).join(' ')).toMatch(/tested load of 0\.6 kg/);
    expect(pla.cautions.map((c) => c.text).join(' ')).toMatch(/safety cable/);
    expect(long.cautions).toEqual([]);
  });

  it('summary · totals · grams per material, whole spools, hours and days per printer, energy where known', () => {
    const pla = summary.totals.byMaterial.find((m) => m.material === 'PLA')!;
    // 3 solid 20 mm cubes at 1.24 g/cm³ = 29.76 g, plus the long covers' PETG in its own row
    expect(pla.pieces).toBe(3);
    expect(pla.grams).toBeCloseTo(29.76, 6);
    expect(pla.spools).toBe(1);
    expect(pla.filamentCost).toBeCloseTo((29.76 / 1000) * 25, 6);
    expect(summary.totals.byMaterial.map((m) => m.material)).toEqual(['PLA', 'PETG', 'ASA']);
    // ASA at 1.07 g/cm³ (trade reference): one 8 cm³ cube = 8.56 g
    expect(summary.totals.byMaterial[2].grams).toBeCloseTo(8.56, 6);

    const cart = summary.totals.byPrinter.find((p) => p.printer?.name === 'Cart printer')!;
    expect(cart.pieces).toBe(5);
    expect(cart.hours).toBeCloseTo(summary.items[0].total!.hours + summary.items[1].total!.hours, 9);
    expect(cart.days).toBe(Math.ceil(cart.hours / 8));
    expect(summary.totals.daysOfPrinting).toBe(Math.max(...summary.totals.byPrinter.map((p) => p.days)));
    expect(summary.items[0].total!.energyCost).toBeCloseTo(((120 * summary.items[0].total!.hours) / 1000) * 0.3, 9);
    expect(summary.items[2].total!.energyCost).toBeNull();
    expect(summary.totals.energyIncluded).toBe('some');
    expect(summary.totals.printCost).toBeCloseTo(summary.totals.filamentCost + summary.totals.energyCost, 9);
    // every item's model was cut into layers (a failure would leave a note and a quick estimate)
    expect(summary.items.flatMap((i: { notes: string[] }) => i.notes).join(' ')).not.toMatch(/could not be sliced/);
    expect(summary.assumptions.join(' ')).toMatch(/cut into layers at the recipe’s layer height/);
  });

  it('summary · buy or print · bought price against print cost, and the printer payback', () => {
    const { buying, payback } = summary.buyOrPrint;
    expect(buying).toMatchObject({ items: 1, total: 12 });
    expect(buying!.printCost).toBeCloseTo(summary.items[0].total!.printCost, 9);
    expect(payback).toMatchObject({ printerPrice: 300, kits: Math.ceil(300 / (12 - buying!.printCost)) });
  });

  it('export · CSV · an attachment with a safe name that papaparse reads back, totals included', async () => {
    const res = await reader
      .get(`/api/kits/${kitId}/export.csv`)
      .buffer(true)
      .parse((r, cb) => {
        let text = '';
        r.setEncoding('utf8');
        r.on('data', (c: string) => (text += c));
        r.on('end', () => cb(null, text));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?salt-flats-car-unit-rm-rf\.csv"?$/);
    const parsed = Papa.parse<Record<string, string>>(res.body as string, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual([
      'Part',
      'Quantity',
      'Material',
      'Printer',
      'Grams',
      'Metres (1.75 mm)',
      'Hours',
      'Cost',
      'Fit',
      'Heat warning',
      'Cautions',
      'Notes',
    ]);
    const rows = parsed.data;
    expect(rows[0]).toMatchObject({ Part: 'Solid test cube', Quantity: '3', Material: 'PLA', Printer: 'Cart printer', Grams: '29.8', Fit: 'as-is' });
    expect(Number(rows[0]['Metres (1.75 mm)'])).toBeCloseTo(3 * (8000 / (Math.PI * 0.875 ** 2) / 1000), 2);
    expect(rows[0]['Heat warning']).toMatch(/will deform.*ASA/);
    expect(rows[0].Cautions).toMatch(/safety cable/);
    expect(rows[0].Notes).toMatch(/PLA deformed in heat/);
    expect(rows[1].Fit).toBe('rotated');
    expect(rows[2].Fit).toBe('no');
    expect(rows.find((r) => r.Part === 'Total PLA')).toMatchObject({ Quantity: '3', Grams: '29.8', Notes: expect.stringMatching(/^1 spool of 1 kg/) });
    const total = rows.find((r) => r.Part === 'Total')!;
    expect(Number(total.Cost)).toBeCloseTo(summary.totals.printCost, 2);
    expect(rows.find((r) => r.Part === 'Printing on Cart printer')!.Notes).toMatch(/day/);
    expect(rows.find((r) => r.Part === 'Printer payback')!.Notes).toMatch(/pays for itself/);
  });

  it('export · a printer named like a formula · the cell starts with an apostrophe', async () => {
    const res = await owner
      .get(`/api/kits/${kitId}/export.csv`)
      .buffer(true)
      .parse((r, cb) => {
        let text = '';
        r.setEncoding('utf8');
        r.on('data', (c: string) => (text += c));
        r.on('end', () => cb(null, text));
      });
    const rows = Papa.parse<Record<string, string>>(res.body as string, { header: true, skipEmptyLines: true }).data;
    expect(rows[3].Printer).toBe(`'=HYPERLINK("http://evil.test","x")`);
    for (const row of rows) for (const cell of Object.values(row)) expect(cell).not.toMatch(/^[=+@]/);
    expect((await stranger.get(`/api/kits/${kitId}/export.csv`)).status).toBe(404);
  });
});
