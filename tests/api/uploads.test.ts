// Uploads that go wrong on the client's side: connections that drop mid-body, malformed multipart
// bodies and hostile file names. These run against a real listening server, since the failures
// live in the socket, not in the app's handlers.
import { existsSync, readdirSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { connect } from 'node:net';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PartFile } from '../../server/db/models';
import { agentFor, createTestApp, makeUser, uploadsDir, type TestApp } from '../helpers/app';
import { boxStl, cubeStl } from '../helpers/meshes';
import { hugeEntry3mf, nestedComponents3mf } from '../helpers/threemf';
import { jpegWithGps, pngDeclaring, pngHtmlPolyglot, pngWithBadCrc, truncatedJpeg } from '../helpers/photos';
import { publishDirectly, seedBodies, submission } from '../helpers/parts';

let t: TestApp;
let server: Server;
let base: string;
let port: number;
const unhandled: unknown[] = [];
const onUnhandled = (reason: unknown) => unhandled.push(reason);

interface Session {
  cookie: string;
  token: string;
}
let member: Session;
let publishedPartId: number;

function mergeCookies(jar: Map<string, string>, res: Response) {
  for (const line of res.headers.getSetCookie()) {
    const [pair] = line.split(';');
    const eq = pair.indexOf('=');
    jar.set(pair.slice(0, eq), pair.slice(eq + 1));
  }
  return [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
}

/** Signs in over real HTTP and returns the session cookie and its CSRF token. */
async function signIn(): Promise<Session> {
  const { email, password } = await makeUser('member');
  const jar = new Map<string, string>();
  let res = await fetch(`${base}/api/auth/csrf`);
  let cookie = mergeCookies(jar, res);
  let { csrfToken } = (await res.json()) as { csrfToken: string };
  res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { cookie, 'x-csrf-token': csrfToken, 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  expect(res.status).toBe(200);
  cookie = mergeCookies(jar, res);
  res = await fetch(`${base}/api/auth/csrf`, { headers: { cookie } });
  cookie = mergeCookies(jar, res);
  ({ csrfToken } = (await res.json()) as { csrfToken: string });
  return { cookie, token: csrfToken };
}

const BOUNDARY = '----rigshelf-test-boundary';

function fieldPart(name: string, value: string): Buffer {
  return Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`);
}

function fileHead(field: string, filename: string, type = 'application/octet-stream'): Buffer {
  return Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; filename="${filename}"\r\nContent-Type: ${type}\r\n\r\n`);
}

const closing = Buffer.from(`--${BOUNDARY}--\r\n`);

/** Sends a multipart request with hand-made bytes and reads the answer. */
async function sendMultipart(session: Session, path: string, body: Buffer): Promise<{ status: number; body: { error?: { code: string; message: string } } }> {
  const res = await fetch(`${base}${path}`, {
    method: 'POST',
    headers: { cookie: session.cookie, 'x-csrf-token': session.token, 'content-type': `multipart/form-data; boundary=${BOUNDARY}` },
    body: new Uint8Array(body),
  });
  return { status: res.status, body: (await res.json()) as { error?: { code: string; message: string } } };
}

const tmpFiles = () => (existsSync(join(uploadsDir, 'tmp')) ? readdirSync(join(uploadsDir, 'tmp')) : []);

async function waitFor(what: string, check: () => boolean | Promise<boolean>, timeoutMs = 20_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

beforeAll(async () => {
  process.on('unhandledRejection', onUnhandled);
  t = await createTestApp();
  await seedBodies();
  server = createServer(t.app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  port = (server.address() as AddressInfo).port;
  base = `http://127.0.0.1:${port}`;
  member = await signIn();
  const author = await signIn();
  const created = await fetch(`${base}/api/parts`, {
    method: 'POST',
    headers: { cookie: author.cookie, 'x-csrf-token': author.token, 'content-type': `multipart/form-data; boundary=${BOUNDARY}` },
    body: new Uint8Array(
      Buffer.concat([
        fieldPart('data', JSON.stringify(submission({ title: 'Shelf part for set reports' }))),
        fileHead('model', 'p.stl'),
        boxStl(20, 30, 10),
        Buffer.from('\r\n'),
        closing,
      ]),
    ),
  });
  expect(created.status).toBe(201);
  publishedPartId = ((await created.json()) as { id: number }).id;
  await publishDirectly(publishedPartId);
});

afterAll(async () => {
  await new Promise<void>((r) => {
    server.close(() => r());
    server.closeAllConnections();
  });
  await t.close();
  process.off('unhandledRejection', onUnhandled);
});

/**
 * Opens a raw connection, sends the headers and the first part of a multipart body that declares
 * far more bytes than it sends, waits until the server has started writing the file, then drops
 * the connection the way a phone losing signal does.
 */
async function abortMidUpload(session: Session, path: string, field: 'model' | 'photo', fileBytes: Buffer) {
  const head = Buffer.concat([fieldPart('data', JSON.stringify(submission())), fileHead(field, `half.${field === 'model' ? 'stl' : 'jpg'}`)]);
  const socket = connect(port, '127.0.0.1');
  await new Promise<void>((r, reject) => socket.once('connect', () => r()).once('error', reject));
  socket.on('error', () => undefined);
  socket.write(
    [
      `POST ${path} HTTP/1.1`,
      `Host: 127.0.0.1:${port}`,
      `Cookie: ${session.cookie}`,
      `X-CSRF-Token: ${session.token}`,
      `Content-Type: multipart/form-data; boundary=${BOUNDARY}`,
      `Content-Length: ${head.length + fileBytes.length * 4 + 200}`,
      '',
      '',
    ].join('\r\n'),
  );
  socket.write(head);
  socket.write(fileBytes);
  await waitFor('the server has started writing the upload', () => tmpFiles().length > 0);
  socket.destroy();
}

describe('uploads · a client that drops the connection mid-body', () => {
  for (const [route, field] of [
    ['part submission', 'model'],
    ['set report', 'photo'],
  ] as const) {
    it(`dropped uploads · ${route} cut off mid-body · the server keeps answering and the half-written file leaves uploads/tmp at once`, async () => {
      const path = route === 'part submission' ? '/api/parts' : `/api/parts/${publishedPartId}/reports`;
      const bytes = field === 'model' ? boxStl(20, 30, 10) : await jpegWithGps(64, 48);
      await abortMidUpload(member, path, field, Buffer.concat([bytes, Buffer.alloc(256 * 1024, 1)]));
      await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
      const health = await fetch(`${base}/api/health`);
      expect(health.status).toBe(200);
      // and a whole upload still goes through afterwards
      const again = await sendMultipart(
        member,
        '/api/parts',
        Buffer.concat([fieldPart('data', JSON.stringify(submission())), fileHead('model', 'ok.stl'), boxStl(10, 10, 10), Buffer.from('\r\n'), closing]),
      );
      expect(again.status).toBe(201);
      expect(unhandled).toEqual([]);
    });
  }
});

describe('uploads · malformed bodies and names are the client’s fault', () => {
  const model = () =>
    Buffer.concat([fieldPart('data', JSON.stringify(submission())), fileHead('model', 'bracket.stl'), boxStl(10, 10, 10), Buffer.from('\r\n')]);

  it('malformed uploads · a multipart body cut off before its closing boundary · 400 with a message, nothing stays in uploads/tmp', async () => {
    const res = await sendMultipart(member, '/api/parts', model());
    expect(res.status).toBe(400);
    expect(res.body.error?.message).toMatch(/incomplete|malformed/i);
    await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
  });

  it('malformed uploads · a raw NUL byte inside a file name header · 400 (a malformed part header), nothing kept', async () => {
    const body = Buffer.concat([
      fieldPart('data', JSON.stringify(submission())),
      fileHead('model', 'bracket\0.stl'),
      boxStl(10, 10, 10),
      Buffer.from('\r\n'),
      closing,
    ]);
    const res = await sendMultipart(member, '/api/parts', body);
    expect(res.status).toBe(400);
    expect(res.body.error?.message).toMatch(/malformed/i);
    await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
  });

  it('malformed uploads · a NUL as a percent escape in an RFC 5987 file name · 400 naming the NUL', async () => {
    const head = Buffer.from(
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="model"; filename*=UTF-8''bracket%00.stl\r\nContent-Type: application/octet-stream\r\n\r\n`,
    );
    const body = Buffer.concat([fieldPart('data', JSON.stringify(submission())), head, boxStl(10, 10, 10), Buffer.from('\r\n'), closing]);
    const res = await sendMultipart(member, '/api/parts', body);
    expect(res.status).toBe(400);
    expect(res.body.error?.message).toMatch(/NUL/);
    await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
  });

  it('malformed uploads · a multipart request without a boundary · 400', async () => {
    const res = await fetch(`${base}/api/parts`, {
      method: 'POST',
      headers: { cookie: member.cookie, 'x-csrf-token': member.token, 'content-type': 'multipart/form-data' },
      body: 'nothing',
    });
    expect(res.status).toBe(400);
  });
});

describe('uploads · photos are checked before the 201', () => {
  type Agent = Awaited<ReturnType<typeof agentFor>>;
  let agent: Agent;
  beforeAll(async () => {
    const { email, password } = await makeUser('member');
    agent = await agentFor(t.app);
    await agent.login(email, password);
  });

  const submitPhoto = (name: string, bytes: Buffer) =>
    agent
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('model', boxStl(10, 10, 10), 'm.stl')
      .attach('photo', bytes, name);

  it('photo checks · a 68-byte PNG declaring 30000 × 30000 pixels · 422 naming the megapixel limit, before any decoding', async () => {
    const png = pngDeclaring(30000, 30000);
    expect(png.length).toBe(68);
    const before = await PartFile.count();
    const res = await submitPhoto('huge.png', png);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('photo_too_large');
    expect(res.body.error.message).toMatch(/30000 × 30000 pixels \(900\.0 megapixels\); photos may have at most 50 megapixels/);
    expect(await PartFile.count()).toBe(before);
    await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
  });

  const broken: [string, string, () => Promise<Buffer> | Buffer, RegExp][] = [
    ['a truncated JPEG', 'cut.jpg', truncatedJpeg, /cut off/],
    ['a PNG whose CRC does not match', 'crc.png', pngWithBadCrc, /cannot be decoded/],
    ['a PNG that goes on as an HTML page (polyglot)', 'poly.png', pngHtmlPolyglot, /cannot be decoded/],
  ];
  for (const [what, name, bytes, reason] of broken) {
    it(`photo checks · ${what} · 422, nothing kept`, async () => {
      const before = await PartFile.count();
      const res = await submitPhoto(name, await bytes());
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe('bad_photo');
      expect(res.body.error.message).toMatch(reason);
      expect(await PartFile.count()).toBe(before);
      await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
    });
  }

  it('photo checks · a photo left pending after two attempts · marked failed at start-up instead of resumed again', async () => {
    const res = await submitPhoto('again.jpg', await jpegWithGps(64, 48));
    expect(res.status).toBe(201);
    await t.services.parts.photosSettled();
    const photo = (await PartFile.findOne({ where: { partId: res.body.id, kind: 'photo' } }))!;
    // as a crash in the middle of the second try leaves it
    await photo.update({ processing: 'pending', processingAttempts: 2 });
    const raw = join(uploadsDir, 'incoming', photo.storedName);
    writeFileSync(raw, await jpegWithGps(64, 48));
    await t.services.parts.recover();
    await t.services.parts.photosSettled();
    await photo.reload();
    expect(photo.processing).toBe('failed');
    expect(existsSync(raw)).toBe(false);
  });

  it('photo checks · a whole photo · goes through and is cleaned', async () => {
    const res = await submitPhoto('ok.jpg', await jpegWithGps(64, 48));
    expect(res.status).toBe(201);
    await t.services.parts.photosSettled();
    const photo = await PartFile.findOne({ where: { partId: res.body.id, kind: 'photo' } });
    expect(photo?.processing).toBe('ready');
    expect(photo?.processingAttempts).toBe(1);
  });
});

describe('uploads · names that mislead', () => {
  type Agent = Awaited<ReturnType<typeof agentFor>>;
  let agent: Agent;
  beforeAll(async () => {
    const { email, password } = await makeUser('member');
    agent = await agentFor(t.app);
    await agent.login(email, password);
  });

  it('misleading names · bidi controls (U+202E and the rest of UAX #9 §2) · stripped from shown names', async () => {
    const name = 'invoice\u202Etxt\u2066\u200F\u061C.stl';
    const res = await agent
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('model', boxStl(10, 10, 10), name)
      .expect(201);
    const model = await PartFile.findOne({ where: { partId: res.body.id, kind: 'model' } });
    expect(model?.originalName).toBe('invoicetxt.stl');
  });

  it('misleading names · a model uploaded as "….exe" · downloads with its model extension', async () => {
    const res = await agent
      .post('/api/parts')
      .field('data', JSON.stringify(submission()))
      .attach('model', boxStl(10, 10, 10), 'invoice\u202Etxt.exe')
      .expect(201);
    const part = await agent.get(`/api/parts/${res.body.id}`).expect(200);
    const model = part.body.files.find((f: { kind: string }) => f.kind === 'model');
    expect(model.name).toBe('invoicetxt.exe.stl');
    const download = await agent.get(model.downloadUrl);
    expect(download.status).toBe(200);
    expect(download.headers['content-disposition']).toMatch(/filename="?invoicetxt\.exe\.stl"?$/);
  });
});

describe('uploads · meshes no printer can build', () => {
  type Agent = Awaited<ReturnType<typeof agentFor>>;
  let agent: Agent;
  beforeAll(async () => {
    const { email, password } = await makeUser('member');
    agent = await agentFor(t.app);
    await agent.login(email, password);
  });
  const submitModel = (name: string, bytes: Buffer, data: object = submission()) =>
    agent.post('/api/parts').field('data', JSON.stringify(data)).attach('model', bytes, name);

  it('mesh limits · a cube with 3e38 mm sides · 422 instead of estimating 8e114 mm³', async () => {
    const res = await submitModel('huge.stl', cubeStl(3e38));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/3\.00e\+38 × 3\.00e\+38 × 3\.00e\+38 mm, larger than any printer builds \(at most 2,000 mm on a side\)/);
  });

  it('mesh limits · a part just over and just under 2 m on one side · refused; accepted', async () => {
    expect((await submitModel('long.stl', boxStl(2001, 10, 10))).status).toBe(422);
    expect((await submitModel('shorter.stl', boxStl(1999, 10, 10))).status).toBe(201);
  });

  it('mesh limits · 100 units marked as drawn in inches (2,540 mm) · refused with a hint about the unit', async () => {
    const res = await submitModel('inches.stl', boxStl(100, 10, 10), submission({ drawnInInches: true }));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/do not mark it as drawn in inches/);
  });

  it('mesh limits · a 3MF of about 490 KB whose model part inflates to 480 MiB · 422 before inflating', async () => {
    const zip = await hugeEntry3mf(480);
    expect(zip.length).toBeLessThan(500 * 1024);
    const res = await submitModel('bomb.3mf', zip);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/would inflate to 480\.0 MB, beyond the 256\.0 MB we unpack/);
    await waitFor('uploads/tmp is empty', () => tmpFiles().length === 0);
  });

  it('mesh limits · a 3MF of a few kilobytes whose nested components expand to 120 million triangles · 422', async () => {
    const zip = Buffer.from(nestedComponents3mf(7, 10));
    expect(zip.length).toBeLessThan(4096);
    const res = await submitModel('nested.3mf', zip);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/expands to 120,000,000 triangles/);
  });
});
