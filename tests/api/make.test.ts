import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CalibrationInfo, MakePreview, MakerList } from '@shared/api/make';
import type { KitItemInfo, KitSummaryResponse } from '@shared/api/planning';
import { analyseModelFile } from '@shared/mesh';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number };
let member: Agent;
let other: Agent;
let visitor: Awaited<ReturnType<typeof agentFor>>;
let printerId: number;

async function signedIn(): Promise<Agent> {
  const u = await makeUser('member');
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id });
}

/** Collects a binary answer (supertest parses only text and JSON on its own). */
function binary(res: request.Response, cb: (err: Error | null, body: Buffer) => void) {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => cb(null, Buffer.concat(chunks)));
}

const washer = { screw: 'M6', clearance: 'normal', outerDiameterMm: 14, thicknessMm: 2 };

beforeAll(async () => {
  t = await createTestApp();
  await seedBodies();
  member = await signedIn();
  other = await signedIn();
  visitor = await agentFor(t.app);
  const printer = await member
    .post('/api/printers')
    .send({ name: 'Bench printer', bedMm: [220, 220, 250], nozzleMm: 0.4, watts: 120 })
    .expect(201);
  printerId = printer.body.id;
});
afterAll(() => t?.close());

describe('make list', () => {
  it('GET /api/make · visitor · every maker with its JSON schema, fields and defaults', async () => {
    const res = await visitor.get('/api/make').expect(200);
    const list = res.body as MakerList;
    const w = list.items.find((m) => m.kind === 'washer')!;
    expect(w.title).toBeTruthy();
    expect(w.defaults).toMatchObject({ screw: '1/4-20' });
    expect(w.fields.map((f) => f.key)).toContain('outerDiameterMm');
    expect((w.schema as { properties?: Record<string, unknown> }).properties).toHaveProperty('outerDiameterMm');
  });
});

describe('make preview', () => {
  it('POST preview · every maker at its defaults · a sound mesh of the pieces it promises', async () => {
    const list = (await visitor.get('/api/make').expect(200)).body as MakerList;
    expect(list.items.length).toBeGreaterThan(0);
    for (const m of list.items) {
      const p = (await visitor.post(`/api/make/${m.kind}/preview`).send({ params: m.defaults }).expect(200)).body as MakePreview;
      expect(p.analysis.watertight, m.kind).toBe(true);
      expect(p.analysis.windingConsistent, m.kind).toBe(true);
      expect(p.analysis.volumeMm3, m.kind).toBeGreaterThan(0);
      expect(p.estimate, m.kind).not.toBeNull();
    }
  });

  it('POST preview · M6 washer · sound mesh, hole per ISO 273 medium, volume, estimate', async () => {
    const res = await visitor.post('/api/make/washer/preview').send({ params: washer, material: 'PETG' }).expect(200);
    const p = res.body as MakePreview;
    expect(p.analysis.watertight).toBe(true);
    expect(p.analysis.windingConsistent).toBe(true);
    expect(p.analysis.shells).toBe(1);
    // ISO 273 medium series: M6 clearance hole 6.6 mm
    expect(p.parameters.holeMm).toBeCloseTo(6.6, 3);
    // annulus π/4·(D² − d²)·t (handbook formula), within the polygon's facet error
    const exact = (Math.PI / 4) * (14 ** 2 - 6.6 ** 2) * 2;
    expect(Math.abs(p.analysis.volumeMm3 - exact) / exact).toBeLessThan(0.01);
    expect(p.estimate!.massG).toBeGreaterThan(0);
    expect(p.estimate!.timeMin).toBeGreaterThan(0);
    expect(p.checks.bedFit).toBeNull();
    expect(p.corrections).toBeNull();
  });

  it('POST preview · load-bearing part, printer and heat · usual cautions, bed fit, heat check, never a rating', async () => {
    const res = await member.post('/api/make/washer/preview').send({ params: washer, material: 'PLA', exposure: 'vehicle-sun', printerId }).expect(200);
    const p = res.body as MakePreview;
    expect(p.checks.bedFit).toMatchObject({ fits: 'as-is', printer: 'Bench printer' });
    expect(p.checks.heat).toMatchObject({ ok: false, exposure: 'vehicle-sun' });
    expect(p.warnings.some((w) => w.includes('softens'))).toBe(true);
    expect(p.checks.cautions.map((c) => c.text).join(' ')).toMatch(/safety cable/);
    expect(p.checks.cautions.map((c) => c.text).join(' ')).toMatch(/key grip, the rigging lead and local codes decide/);
    expect(JSON.stringify(p)).not.toMatch(/tested load of/);
  });

  it('POST preview · bad sizes · 422 with a message per field and nothing stored', async () => {
    const res = await visitor
      .post('/api/make/washer/preview')
      .send({ params: { ...washer, outerDiameterMm: 500, screw: 'M99' } })
      .expect(422);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields['params.outerDiameterMm']).toMatch(/at most/);
    expect(res.body.error.fields['params.screw']).toMatch(/choose one of/);
    const tooThin = await visitor
      .post('/api/make/washer/preview')
      .send({ params: { ...washer, outerDiameterMm: 7 } })
      .expect(422);
    expect(tooThin.body.error.fields['params.outerDiameterMm']).toMatch(/at least/);
    const layer = await visitor
      .post('/api/make/washer/preview')
      .send({ params: washer, recipe: { nozzleMm: 0.4, layerMm: 0.4 } })
      .expect(422);
    expect(layer.body.error.fields['recipe.layerMm']).toMatch(/too thick/);
  });

  it('POST preview · unknown maker · 404 naming the makers', async () => {
    const res = await visitor.post('/api/make/teapot/preview').send({ params: {} }).expect(404);
    expect(res.body.error.message).toMatch(/washer/);
  });

  it('POST preview · someone else’s printer · 422 on printerId', async () => {
    const res = await other.post('/api/make/washer/preview').send({ params: washer, printerId }).expect(422);
    expect(res.body.error.fields.printerId).toBeTruthy();
  });
});

describe('make file', () => {
  it('POST file · STL and 3MF · attachments whose analysis matches the preview', async () => {
    const preview = (await visitor.post('/api/make/washer/preview').send({ params: washer }).expect(200)).body as MakePreview;
    const stl = await visitor.post('/api/make/washer/file?format=stl').send({ params: washer }).buffer(true).parse(binary).expect(200);
    expect(stl.headers['content-disposition']).toMatch(/^attachment; filename="?washer[\w.-]*\.stl"?$/);
    const threeMf = await visitor.post('/api/make/washer/file?format=3mf').send({ params: washer }).buffer(true).parse(binary).expect(200);
    expect(threeMf.headers['content-disposition']).toMatch(/\.3mf"?$/);
    const fromStl = analyseModelFile(new Uint8Array(stl.body as Buffer));
    const from3mf = analyseModelFile(new Uint8Array(threeMf.body as Buffer));
    for (const a of [fromStl, from3mf]) {
      expect(a.watertight).toBe(true);
      expect(a.volumeMm3).toBeCloseTo(preview.analysis.volumeMm3, 1);
    }
    // the 3MF declares millimetres (3MF core spec, unit attribute)
    expect(from3mf.unitScale ?? 1).toBe(1);
  });

  it('POST file · wrong format · 422', async () => {
    const res = await visitor.post('/api/make/washer/file?format=obj').send({ params: washer }).expect(422);
    expect(res.body.error.fields.format).toMatch(/stl or format=3mf/);
  });
});

describe('printer calibrations', () => {
  it('POST calibrations · owner · stored per material and applied to the drawn hole', async () => {
    const before = (await member.post('/api/make/washer/preview').send({ params: washer, printerId, material: 'PETG' }).expect(200)).body as MakePreview;
    // the 6.80 mm bore of a gauge round a 6.6 mm pin fitted: holes print 0.2 mm small
    const res = await member
      .post(`/api/printers/${printerId}/calibrations`)
      .send({ material: 'PETG', nominalMm: 6.6, holeFitMm: 6.8, outerFitMm: 6.5 })
      .expect(201);
    const c = res.body as CalibrationInfo;
    expect(c.holeCorrectionMm).toBeCloseTo(0.2, 6);
    expect(c.outerCorrectionMm).toBeCloseTo(-0.1, 6);
    expect(c.note).toMatch(/drawn 0.2 mm larger/);

    const after = (await member.post('/api/make/washer/preview').send({ params: washer, printerId, material: 'PETG' }).expect(200)).body as MakePreview;
    expect((after.parameters.holeMm as number) - (before.parameters.holeMm as number)).toBeCloseTo(0.2, 6);
    expect(after.corrections).toMatchObject({ holeMm: 0.2, outerMm: -0.1, printer: 'Bench printer', material: 'PETG' });
    expect(after.calibrationNotes.join(' ')).toMatch(/Hole drawn at 6.8 mm so it prints at 6.6 mm on your printer/);
    // outside sizes take the outer correction: 14 mm drawn at 13.9 mm
    expect(after.analysis.sizeMm[0]).toBeCloseTo(before.analysis.sizeMm[0] - 0.1, 3);

    // another material on the same printer is not corrected
    const pla = (await member.post('/api/make/washer/preview').send({ params: washer, printerId, material: 'PLA' }).expect(200)).body as MakePreview;
    expect(pla.corrections).toBeNull();

    // a second gauge replaces the first
    await member.post(`/api/printers/${printerId}/calibrations`).send({ material: 'PETG', nominalMm: 6.6, holeFitMm: 6.7 }).expect(201);
    const list = await member.get(`/api/printers/${printerId}/calibrations`).expect(200);
    expect(list.body.items).toHaveLength(1);
    expect(list.body.items[0].holeCorrectionMm).toBeCloseTo(0.1, 6);
  });

  it('POST calibrations · not the owner, visitor, or a wild step · 404, 401, 422', async () => {
    await other.post(`/api/printers/${printerId}/calibrations`).send({ material: 'PETG', nominalMm: 15, holeFitMm: 15.2 }).expect(404);
    await visitor.post(`/api/printers/${printerId}/calibrations`).send({ material: 'PETG', nominalMm: 15, holeFitMm: 15.2 }).expect(401);
    const wild = await member.post(`/api/printers/${printerId}/calibrations`).send({ material: 'PETG', nominalMm: 15, holeFitMm: 19 }).expect(422);
    expect(wild.body.error.fields.holeFitMm).toMatch(/not a step of that gauge/);
    await other.get(`/api/printers/${printerId}/calibrations`).expect(404);
  });
});

describe('made parts in kits and on the shelf', () => {
  it('POST kits/:id/made · a made washer · planned from its figures with the cautions', async () => {
    const kit = await member.post('/api/kits').send({ name: 'Tuesday unit' }).expect(201);
    const res = await member
      .post(`/api/kits/${kit.body.id}/made`)
      .send({ kind: 'washer', params: washer, material: 'PETG', printerId, quantity: 4 })
      .expect(201);
    const item = res.body as KitItemInfo;
    expect(item.part).toBeNull();
    expect(item.made).toMatchObject({ kind: 'washer', loadBearing: true });
    expect(item.made!.summary).toMatch(/outside diameter 14 mm/);
    const summary = (await member.get(`/api/kits/${kit.body.id}/summary`).expect(200)).body as KitSummaryResponse;
    expect(summary.items[0].part).toBeNull();
    expect(summary.items[0].total!.massG).toBeGreaterThan(0);
    expect(summary.items[0].cautions.map((c) => c.text).join(' ')).toMatch(/safety cable/);
    await member.patch(`/api/kits/${kit.body.id}/items/${item.id}`).send({ quantity: 2 }).expect(200);
    await member.patch(`/api/kits/${kit.body.id}/items/${item.id}`).send({ recipeId: 1 }).expect(422);
    await other.post(`/api/kits/${kit.body.id}/made`).send({ kind: 'washer', params: washer }).expect(404);
    const bad = await member
      .post(`/api/kits/${kit.body.id}/made`)
      .send({ kind: 'washer', params: { ...washer, thicknessMm: -1 } })
      .expect(422);
    expect(bad.body.error.fields['params.thicknessMm']).toBeTruthy();
  });

  it('POST parts · made with a maker · recorded on the revision and shown on the part page', async () => {
    const stl = await member.post('/api/make/washer/file?format=stl').send({ params: washer }).buffer(true).parse(binary).expect(200);
    const data = submission({ make: { kind: 'washer', params: washer }, testedLoadKg: null, title: 'M6 spacer washer 14 mm' });
    const res = await member
      .post('/api/parts')
      .field('data', JSON.stringify(data))
      .attach('model', stl.body as Buffer, 'washer.stl');
    expect(res.status).toBe(201);
    const part = await member.get(`/api/parts/${res.body.id}`).expect(200);
    expect(part.body.madeWith).toMatchObject({ kind: 'washer', params: { screw: 'M6', outerDiameterMm: 14 } });
    expect(part.body.madeWith.summary).toMatch(/screw M6/);

    const rated = submission({ make: { kind: 'washer', params: washer }, testedLoadKg: 5 });
    const refused = await member
      .post('/api/parts')
      .field('data', JSON.stringify(rated))
      .attach('model', stl.body as Buffer, 'washer.stl');
    expect(refused.status).toBe(422);
    expect(refused.body.error.fields.testedLoadKg).toMatch(/no tested load/);
    const wrong = submission({ make: { kind: 'washer', params: { ...washer, screw: 'M99' } }, testedLoadKg: null });
    const wrongRes = await member
      .post('/api/parts')
      .field('data', JSON.stringify(wrong))
      .attach('model', stl.body as Buffer, 'washer.stl');
    expect(wrongRes.status).toBe(422);
    expect(wrongRes.body.error.fields['make.params.screw']).toBeTruthy();
  });
});
