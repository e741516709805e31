// The shaded picture drawn from each model: stored like photos, shown where a part has no photo.
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { imageSize } from 'image-size';
import { Jimp } from 'jimp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PartFile } from '../../server/db/models';
import { RENDER_COLOURS, RENDER_DISPLAY, RENDER_THUMB } from '../../server/modules/files/render-model';
import { agentFor, createTestApp, makeUser, uploadsDir, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { publishDirectly, seedBodies, submission } from '../helpers/parts';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof agentFor>>;
let author: Agent;
let visitor: Agent;

beforeAll(async () => {
  t = await createTestApp({ MODEL_PICTURES: '1' });
  await seedBodies();
  const u = await makeUser('member');
  author = await agentFor(t.app);
  await author.login(u.email, u.password);
  visitor = await agentFor(t.app);
});
afterAll(async () => {
  await t.close();
});

function submit(a: Agent, photo?: Buffer) {
  let req = a
    .post('/api/parts')
    .field('data', JSON.stringify(submission()))
    .attach('model', boxStl(40, 30, 12), 'plate.stl');
  if (photo) req = req.attach('photo', photo, 'on-the-rig.png');
  return req;
}

const settled = async () => {
  await t.services.parts.photosSettled();
  await t.services.parts.rendersSettled();
};

async function image(a: Agent, url: string) {
  const res = await a
    .get(url)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('image/jpeg');
  return res.body as Buffer;
}

// pictures are drawn by a low-priority thread: on a loaded machine one can take tens of seconds
describe('model pictures · drawn at upload', { timeout: 180_000 }, () => {
  it('model pictures · a part without photos · a 1200 × 900 picture and a 480 × 360 thumbnail of its model; cards use it', async () => {
    const { body } = await submit(author).expect(201);
    await settled();
    const part = (await author.get(`/api/parts/${body.id}`).expect(200)).body;
    const model = part.files.find((f: { kind: string }) => f.kind === 'model');
    expect(model).toMatchObject({ picture: 'ready', displayUrl: `/api/parts/${body.id}/files/${model.id}/image/display` });

    const display = await image(author, model.displayUrl);
    expect(imageSize(display)).toMatchObject({ width: RENDER_DISPLAY.width, height: RENDER_DISPLAY.height });
    const thumb = await image(author, model.thumbnailUrl);
    expect(imageSize(thumb)).toMatchObject({ width: RENDER_THUMB.width, height: RENDER_THUMB.height });

    // a few pixels: the backdrop's top corner, the part in the middle of its area, the size column
    const picture = await Jimp.read(display);
    const rgb = (x: number, y: number) => {
      const c = picture.getPixelColor(x, y);
      return [(c >>> 24) & 255, (c >>> 16) & 255, (c >>> 8) & 255];
    };
    const near = (a: number[], b: readonly number[], tol: number) => a.every((v, i) => Math.abs(v - b[i]) <= tol);
    expect(near(rgb(2, 2), RENDER_COLOURS.backdropTop, 6)).toBe(true); // JPEG keeps a flat area within a few levels
    const centre = rgb(Math.round(RENDER_DISPLAY.width * (0.03 + 0.68 / 2)), RENDER_DISPLAY.height / 2);
    expect(centre[1]).toBeGreaterThan(centre[0] + 30); // the cyc-green part, not the grey backdrop
    // the measured size is printed in dark ink in the right-hand column
    let dark = 0;
    for (let y = Math.round(RENDER_DISPLAY.height * 0.36); y < RENDER_DISPLAY.height * 0.6; y += 2) {
      for (let x = Math.round(RENDER_DISPLAY.width * 0.74); x < RENDER_DISPLAY.width * 0.95; x += 2) if (rgb(x, y)[0] < 80) dark += 1;
    }
    expect(dark).toBeGreaterThan(100);

    await publishDirectly(body.id);
    const list = (await visitor.get('/api/parts').expect(200)).body.items;
    expect(list.find((p: { id: number }) => p.id === body.id).thumbnailUrl).toBe(model.thumbnailUrl);
    // the picture is served to visitors like a photo of a published part
    expect((await visitor.get(model.thumbnailUrl)).status).toBe(200);
  });

  it('model pictures · a part with a photo · its card shows the photo; the model picture stays in its files', async () => {
    const { body } = await submit(author, await plainPng()).expect(201);
    await settled();
    await publishDirectly(body.id);
    const part = (await author.get(`/api/parts/${body.id}`).expect(200)).body;
    const photo = part.files.find((f: { kind: string }) => f.kind === 'photo');
    const model = part.files.find((f: { kind: string }) => f.kind === 'model');
    expect(model.picture).toBe('ready');
    const list = (await visitor.get('/api/parts').expect(200)).body.items;
    expect(list.find((p: { id: number }) => p.id === body.id).thumbnailUrl).toBe(photo.thumbnailUrl);
  });

  it('model pictures · a source file; a model removed · no picture (404); its pictures leave the disk', async () => {
    const { body } = await author
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('model', boxStl(20, 20, 20), 'a.stl')
      .attach('model', boxStl(10, 20, 30), 'b.stl')
      .attach('source', Buffer.from('ISO-10303-21;\nHEADER;\nENDSEC;\nEND-ISO-10303-21;\n'), 'a.step')
      .expect(201);
    await settled();
    const part = (await author.get(`/api/parts/${body.id}`).expect(200)).body;
    const source = part.files.find((f: { kind: string }) => f.kind === 'source');
    expect(source.picture).toBeNull();
    expect((await author.get(`/api/parts/${body.id}/files/${source.id}/image/display`)).status).toBe(404);
    const second = part.files.filter((f: { kind: string }) => f.kind === 'model')[1];
    const row = (await PartFile.findByPk(second.id))!;
    const onDisk = () => readdirSync(join(uploadsDir, 'store')).filter((n) => n.startsWith(row.storedName));
    expect(onDisk().sort()).toEqual([row.storedName, `${row.storedName}-display.jpg`, `${row.storedName}-thumb.jpg`]);
    await author.delete(`/api/parts/${body.id}/files/${second.id}`).expect(200);
    expect(onDisk()).toEqual([]);
  });
});

describe('model pictures · start-up', { timeout: 180_000 }, () => {
  it('model pictures · models waiting at start-up (cut off by a stop, or older than pictures) · drawn by the recovery; the sweep keeps the pictures', async () => {
    const { body } = await submit(author).expect(201);
    await settled();
    const model = (await PartFile.findOne({ where: { partId: body.id, kind: 'model' } }))!;
    // as migration 0014 leaves every stored model
    await model.update({ renderStatus: 'pending', renderAttempts: 0 });
    const display = join(uploadsDir, 'store', `${model.storedName}-display.jpg`);
    const recovered = await t.services.parts.recover();
    expect(recovered.pictures).toBeGreaterThanOrEqual(1);
    await settled();
    await model.reload();
    expect(model).toMatchObject({ renderStatus: 'ready', renderAttempts: 1 });
    expect(existsSync(display)).toBe(true);
    // a second start: nothing waiting, nothing of the picture swept
    await t.services.parts.recover();
    expect(existsSync(display)).toBe(true);
  });
});
