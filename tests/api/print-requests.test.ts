import { createServer, type Server } from 'node:http';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PrintRequestDetail, PrintRequestList } from '@shared/api/print-requests';
import type { StatementInfo } from '@shared/api/statement';
import type { Role } from '@shared/types';
import { Crew, CrewMember, MailMessage, Notice, PaymentEvent, PrintRequest, PrintRequestEvent } from '../../server/db/models';
import type { PaymentsFake } from '../../server/modules/payments/fake';
import { agentFor, createTestApp, makeUser, type TestApp } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { seedBodies, setReadyRecipe, submission } from '../helpers/parts';

let t: TestApp;
let server: Server;
let fake: PaymentsFake;
type Agent = Awaited<ReturnType<typeof agentFor>> & { userId: number; email: string };
let asker: Agent;
let owner: Agent;
let outsider: Agent;
let moderator: Agent;
let crewId: number;
let printerId: number;
let cubePart: number;
let ncPart: number;

const solidPla = { ...setReadyRecipe, material: 'PLA', hotendC: 210, bedC: 60, infillPct: 100 } as const;

async function signedIn(role: Role = 'member'): Promise<Agent> {
  const u = await makeUser(role);
  const a = await agentFor(t.app);
  await a.login(u.email, u.password);
  return Object.assign(a, { userId: u.user.id, email: u.email });
}

async function published(data: unknown, model: Buffer): Promise<number> {
  const author = await signedIn();
  const res = await author.post('/api/parts').field('data', JSON.stringify(data)).attach('model', model, 'part.stl');
  expect(res.status).toBe(201);
  await moderator.post(`/api/review/${res.body.id}/approve`).send({}).expect(200);
  return res.body.id;
}

async function ask(body: Record<string, unknown> = {}): Promise<PrintRequestDetail> {
  const res = await asker
    .post('/api/print-requests')
    .send({ crewId, printerId, partId: cubePart, quantity: 3, neededBy: '2030-01-15', note: 'For the B camera.', ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

async function read(id: number, who: Agent = asker): Promise<PrintRequestDetail> {
  return (await who.get(`/api/print-requests/${id}`).expect(200)).body;
}

/** Accepted and paid through the SDK against the fake, as a member does it. */
async function acceptedAndPaid(): Promise<PrintRequestDetail> {
  const r = await ask({ quantity: 1 });
  await owner.post(`/api/print-requests/${r.id}/accept`).send({}).expect(200);
  const checkout = await asker.post(`/api/print-requests/${r.id}/checkout`).send({});
  expect(checkout.status).toBe(200);
  const sent = await fake.pay(sessionOf(checkout.body.url));
  expect(sent.answered).toBe(200);
  return read(r.id);
}

const sessionOf = (url: string) => new URL(url).pathname.split('/').pop()!;

beforeAll(async () => {
  t = await createTestApp();
  server = createServer(t.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const address = server.address() as { port: number };
  fake = (await t.services.payments.fake())!;
  fake.webhookUrl = `http://127.0.0.1:${address.port}/api/payments/webhook`;

  await seedBodies();
  moderator = await signedIn('moderator');
  [asker, owner, outsider] = await Promise.all([signedIn(), signedIn(), signedIn()]);
  cubePart = await published(submission({ title: 'Solid test cube', recipes: [solidPla] }), boxStl(20, 20, 20));
  ncPart = await published(submission({ title: 'Monitor hood clip', licence: 'CC-BY-NC-4.0', recipes: [solidPla] }), boxStl(30, 10, 10));

  const crew = await Crew.create({ name: 'Unit B camera', production: 'The Lighthouse Keeper', currency: 'EUR', taxRatePct: 19, createdBy: asker.userId });
  crewId = crew.id;
  await CrewMember.bulkCreate([
    { crewId, userId: asker.userId, role: 'lead' },
    { crewId, userId: owner.userId, role: 'member' },
  ]);
  const printer = await owner.post('/api/printers').send({ name: 'Cart printer', bedMm: [220, 220, 250], nozzleMm: 0.4, watts: 150 });
  expect(printer.status).toBe(201);
  printerId = printer.body.id;
  await owner.agent
    .put('/api/me/prices')
    .set('X-CSRF-Token', owner.token)
    .send({ prices: { PLA: 25 }, pricePerKwh: 0.4, machineHourRate: 1.2 })
    .expect(200);
});
afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await t.close();
});

describe('print requests · asking and the price', () => {
  it('print requests · crew printers · a crew mate’s printer is offered; an outsider sees none', async () => {
    const mine = (await asker.get('/api/print-requests/printers').expect(200)).body.items;
    expect(mine).toEqual([
      expect.objectContaining({
        id: printerId,
        name: 'Cart printer',
        owner: expect.objectContaining({ id: owner.userId }),
        crew: expect.objectContaining({ id: crewId, currency: 'EUR' }),
      }),
    ]);
    expect((await outsider.get('/api/print-requests/printers').expect(200)).body.items).toEqual([]);
  });

  it('print requests · 3 solid cubes · grams and minutes are 3 × the estimate, priced with the owner’s sheet', async () => {
    const r = await ask();
    expect(r.status).toBe('requested');
    expect(r.priceFrozen).toBe(false);
    // the same estimate the planning page gives for this file and recipe
    const cube = (await moderator.get(`/api/parts/${cubePart}`).expect(200)).body;
    const fileId = cube.files.find((f: { kind: string }) => f.kind === 'model').id;
    const e = (
      await asker
        .post('/api/estimate')
        .send({ fileId, material: 'PLA', nozzleMm: 0.4, layerMm: 0.2, walls: 4, topBottomLayers: 5, infillPct: 100, speedMmS: 60 })
        .expect(200)
    ).body;
    // handbook density of PLA 1.24 g/cm³ (as in the planning tests): a solid 20 mm cube weighs 9.92 g
    expect(e.massG).toBeCloseTo(9.92, 3);
    expect(r.estimate.grams).toBeCloseTo(Math.round(3 * e.massG * 10) / 10, 6);
    expect(r.estimate.minutes).toBeCloseTo(Math.round(3 * e.timeMin * 10) / 10, 6);
    // by hand: 29.8 g × 25 /kg = 0.745 → 0.75 (half up)
    const filament = r.price.lines.find((l) => l.kind === 'filament')!;
    expect(r.price.figures.grams).toBe(29.8);
    expect(filament.amountMinor).toBe(75);
    // energy = 150 W × h ÷ 1000 × 0.40; machine time = h × 1.20 (hours rounded to 0.01 h)
    const hours = Math.round((r.estimate.minutes * 100) / 60) / 100;
    const wh = Math.round((150 * r.estimate.minutes) / 60);
    expect(r.price.lines.find((l) => l.kind === 'energy')!.amountMinor).toBe(Math.round((wh / 1000) * 0.4 * 100 + 1e-9));
    expect(r.price.lines.find((l) => l.kind === 'machine')!.amountMinor).toBe(Math.round(hours * 1.2 * 100 + 1e-9));
    expect(r.price.totalMinor).toBe(r.price.lines.reduce((s, l) => s + l.amountMinor, 0));
    expect(r.price.currency).toBe('EUR');
    // on record, with a notice and a mail for the printer's owner
    expect(r.history).toEqual([
      expect.objectContaining({ action: 'asked', to: 'requested', actor: expect.objectContaining({ id: asker.userId }), note: 'For the B camera.' }),
    ]);
    expect(await Notice.count({ where: { userId: owner.userId, kind: 'print-request' } })).toBeGreaterThan(0);
    expect(await MailMessage.count({ where: { toAddress: owner.email } })).toBeGreaterThan(0);
  });

  it('print requests · bad asks · 422 with a message per field, nothing stored', async () => {
    const before = await PrintRequest.count();
    const both = await asker.post('/api/print-requests').send({ crewId, printerId, partId: cubePart, kitId: 1 });
    expect(both.status).toBe(422);
    expect(both.body.error.fields.partId).toMatch(/one of the two/);
    const ownPrinter = await owner.post('/api/print-requests').send({ crewId, printerId, partId: cubePart });
    expect(ownPrinter.status).toBe(422);
    expect(ownPrinter.body.error.fields.printerId).toMatch(/your own printer/);
    const notInCrew = await outsider.post('/api/print-requests').send({ crewId, printerId, partId: cubePart });
    expect(notInCrew.status).toBe(422);
    expect(notInCrew.body.error.fields.crewId).toMatch(/not in that crew/);
    const tooMany = await asker.post('/api/print-requests').send({ crewId, printerId, partId: cubePart, quantity: 500 });
    expect(tooMany.status).toBe(422);
    expect(await PrintRequest.count()).toBe(before);
  });

  it('print requests · a whole kit · one request priced per material; the owner reads the items', async () => {
    const kit = (await asker.post('/api/kits').send({ name: 'Second unit spares' }).expect(201)).body;
    await asker.post(`/api/kits/${kit.id}/items`).send({ partId: cubePart, quantity: 2 }).expect(201);
    const res = await asker.post('/api/print-requests').send({ crewId, printerId, kitId: kit.id });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const r = res.body as PrintRequestDetail;
    expect(r.kind).toBe('kit');
    expect(r.title).toBe('Kit: Second unit spares');
    // 2 solid 20 mm PLA cubes at 1.24 g/cm³ (handbook density, as above): 19.84 g
    expect(r.estimate.grams).toBeCloseTo(19.8, 1);
    expect(r.price.lines.filter((l) => l.kind === 'filament').map((l) => l.label)).toEqual(['Filament (PLA)']);
    expect((await read(r.id, owner)).estimate.notes.join(' ')).toMatch(/Items: 2 × Solid test cube \(PLA\)/);
  });

  it('print requests · a part published to another crew only · refused, nothing stored', async () => {
    const other = await Crew.create({ name: 'Splinter unit', production: null, currency: 'GBP', taxRatePct: null, createdBy: outsider.userId });
    const { Part } = await import('../../server/db/models');
    await CrewMember.create({ crewId: other.id, userId: asker.userId, role: 'member' });
    await Part.update({ crewId: other.id }, { where: { id: ncPart } });
    try {
      const before = await PrintRequest.count();
      const res = await asker.post('/api/print-requests').send({ crewId, printerId, partId: ncPart });
      expect(res.status).toBe(422);
      expect(res.body.error.fields.crewId).toMatch(/one crew only/);
      expect(await PrintRequest.count()).toBe(before);
    } finally {
      await Part.update({ crewId: null }, { where: { id: ncPart } });
      await CrewMember.destroy({ where: { crewId: other.id } });
      await other.destroy();
    }
  });

  it('print requests · someone else’s request · 404 for an outsider, steps refused by role', async () => {
    const r = await ask();
    await outsider.get(`/api/print-requests/${r.id}`).expect(404);
    expect((await outsider.post(`/api/print-requests/${r.id}/accept`).send({})).status).toBe(404);
    const byRequester = await asker.post(`/api/print-requests/${r.id}/accept`).send({});
    expect(byRequester.status).toBe(403);
    const byOwner = await owner.post(`/api/print-requests/${r.id}/cancel`).send({});
    expect(byOwner.status).toBe(403);
    const early = await owner.post(`/api/print-requests/${r.id}/printed`).send({});
    expect(early.status).toBe(409);
    expect(early.body.error.message).toMatch(/cannot be marked as printed/);
    expect((await asker.post(`/api/print-requests/${r.id}/checkout`).send({})).status).toBe(409);
    expect((await read(r.id)).status).toBe('requested');
  });

  it('print requests · accepted · the price freezes and later price changes leave it alone', async () => {
    const r = await ask();
    const accepted = (await owner.post(`/api/print-requests/${r.id}/accept`).send({ note: 'Tomorrow morning.' }).expect(200)).body as PrintRequestDetail;
    expect(accepted.priceFrozen).toBe(true);
    expect(accepted.price.totalMinor).toBe(r.price.totalMinor);
    await owner.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', owner.token)
      .send({ prices: { PLA: 90 }, pricePerKwh: 0.4 })
      .expect(200);
    expect((await read(r.id)).price.totalMinor).toBe(r.price.totalMinor);
    // a request not yet accepted shows the new prices
    expect((await ask()).price.totalMinor).toBeGreaterThan(r.price.totalMinor);
    await owner.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', owner.token)
      .send({ prices: { PLA: 25 }, pricePerKwh: 0.4, machineHourRate: 1.2 })
      .expect(200);
  });

  it('print requests · asked to handed over · every step on record with who, and the requester told each time', async () => {
    const r = await ask();
    const mailsBefore = await MailMessage.count({ where: { toAddress: asker.email } });
    for (const step of ['accept', 'fit-tested', 'printed', 'handed-over']) {
      await owner.post(`/api/print-requests/${r.id}/${step}`).send({}).expect(200);
    }
    const done = await read(r.id);
    expect(done.status).toBe('handed_over');
    expect(done.history.map((h) => [h.action, h.from, h.to, h.actor?.id])).toEqual([
      ['asked', null, 'requested', asker.userId],
      ['accept', 'requested', 'accepted', owner.userId],
      ['fit-tested', 'accepted', 'fit_tested', owner.userId],
      ['printed', 'fit_tested', 'printed', owner.userId],
      ['handed-over', 'printed', 'handed_over', owner.userId],
    ]);
    expect(done.history.every((h) => !Number.isNaN(Date.parse(h.at)))).toBe(true);
    expect(await MailMessage.count({ where: { toAddress: asker.email } })).toBe(mailsBefore + 4);
    expect(done.actions).toEqual([]);
    expect(done.payment.canPay).toBe(true);
  });
});

describe('print requests · paying back through the SDK and the local fake', () => {
  it('paying back · checkout · the SDK creates a session on the fake for the frozen price; its page asks for no card', async () => {
    const r = await ask({ quantity: 1 });
    await owner.post(`/api/print-requests/${r.id}/accept`).send({}).expect(200);
    const res = await asker.post(`/api/print-requests/${r.id}/checkout`).send({});
    expect(res.status).toBe(200);
    expect(res.body.url).toMatch(new RegExp(`^${fake.url}/pay/cs_`));
    const session = fake.sessions.get(sessionOf(res.body.url))!;
    expect(session.amount_total).toBe(r.price.totalMinor);
    expect(session.currency).toBe('eur');
    expect(session.metadata.printRequestId).toBe(String(r.id));
    const page = await fetch(res.body.url);
    expect(await page.text()).toMatch(/Nothing is charged/);
    expect((await read(r.id)).payment.status).toBe('pending');
    // only the requester pays
    expect((await owner.post(`/api/print-requests/${r.id}/checkout`).send({})).status).toBe(403);
  });

  it('paying back · verified webhook · paid, the owner told; a replayed event changes nothing', async () => {
    const paid = await acceptedAndPaid();
    expect(paid.payment).toMatchObject({ status: 'paid', paidMinor: paid.price.totalMinor });
    expect(paid.history.at(-1)).toMatchObject({ action: 'paid', actor: null });
    const sent = fake.events.at(-1)!;
    const events = await PrintRequestEvent.count({ where: { requestId: paid.id } });
    for (let i = 0; i < 2; i++) {
      const replay = await asker.agent
        .post('/api/payments/webhook')
        .set('Content-Type', 'application/json')
        .set('Stripe-Signature', sent.signature)
        .send(sent.payload);
      expect(replay.status).toBe(200);
      expect(replay.body).toEqual({ received: true, duplicate: true });
    }
    const after = await read(paid.id);
    expect(after.payment.paidMinor).toBe(paid.price.totalMinor);
    expect(await PrintRequestEvent.count({ where: { requestId: paid.id } })).toBe(events);
    expect(await PaymentEvent.count({ where: { eventId: sent.id } })).toBe(1);
    expect((await asker.post(`/api/print-requests/${paid.id}/checkout`).send({})).status).toBe(409);
  });

  it('paying back · forged webhooks · 400 and nothing changes', async () => {
    const r = await ask({ quantity: 1 });
    await owner.post(`/api/print-requests/${r.id}/accept`).send({}).expect(200);
    const checkout = await asker.post(`/api/print-requests/${r.id}/checkout`).send({});
    const session = fake.sessions.get(sessionOf(checkout.body.url))!;
    const forgedSession = { ...session, status: 'complete', payment_status: 'paid', payment_intent: 'pi_forged' };
    const payload = JSON.stringify({ id: 'evt_forged_1', object: 'event', type: 'checkout.session.completed', data: { object: forgedSession } });
    // signed with a secret that is not ours
    const Stripe = (await import('stripe')).default;
    const wrong = new Stripe('sk_test_x').webhooks.generateTestHeaderString({ payload, secret: 'whsec_someone_else' });
    const before = { events: await PaymentEvent.count(), steps: await PrintRequestEvent.count({ where: { requestId: r.id } }) };
    for (const signature of [wrong, 't=1,v1=deadbeef', undefined]) {
      let req = asker.agent.post('/api/payments/webhook').set('Content-Type', 'application/json');
      if (signature) req = req.set('Stripe-Signature', signature);
      const res = await req.send(payload);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('bad_signature');
    }
    // a real signature over different bytes
    const real = fake.events.at(-1)!;
    const tampered = await asker.agent
      .post('/api/payments/webhook')
      .set('Content-Type', 'application/json')
      .set('Stripe-Signature', real.signature)
      .send(payload);
    expect(tampered.status).toBe(400);
    const after = await read(r.id);
    expect(after.payment.status).toBe('pending');
    expect(after.payment.paidMinor).toBe(0);
    expect(await PaymentEvent.count()).toBe(before.events);
    expect(await PrintRequestEvent.count({ where: { requestId: r.id } })).toBe(before.steps);
  });

  it('paying back · paid, then cancelled · refunded in full through the SDK, the requester told', async () => {
    const paid = await acceptedAndPaid();
    const refundsBefore = fake.refunds.length;
    const cancelled = (await asker.post(`/api/print-requests/${paid.id}/cancel`).send({ note: 'Shoot moved.' }).expect(200)).body as PrintRequestDetail;
    expect(cancelled.status).toBe('cancelled');
    expect(cancelled.payment.status).toBe('refunded');
    expect(cancelled.payment.refundedAt).not.toBeNull();
    expect(fake.refunds.length).toBe(refundsBefore + 1);
    expect(fake.refunds.at(-1)).toMatchObject({ amount: paid.price.totalMinor, status: 'succeeded' });
    expect(cancelled.history.map((h) => h.action).slice(-2)).toEqual(['cancel', 'refunded']);
    expect(await Notice.count({ where: { userId: asker.userId, title: `Your payment was refunded: ${paid.title}` } })).toBeGreaterThan(0);
  });

  it('paying back · paid, then declined by the owner · refunded', async () => {
    const paid = await acceptedAndPaid();
    const declined = (await owner.post(`/api/print-requests/${paid.id}/decline`).send({}).expect(200)).body as PrintRequestDetail;
    expect(declined.payment.status).toBe('refunded');
    expect(fake.refunds.at(-1)).toMatchObject({ amount: paid.price.totalMinor });
  });

  it('paying back · payment arrives after the request was cancelled (out of order) · taken and refunded at once', async () => {
    const r = await ask({ quantity: 1 });
    await owner.post(`/api/print-requests/${r.id}/accept`).send({}).expect(200);
    const checkout = await asker.post(`/api/print-requests/${r.id}/checkout`).send({});
    await asker.post(`/api/print-requests/${r.id}/cancel`).send({}).expect(200);
    const sent = await fake.pay(sessionOf(checkout.body.url));
    expect(sent.answered).toBe(200);
    const after = await read(r.id);
    expect(after.status).toBe('cancelled');
    expect(after.payment.status).toBe('refunded');
    expect(fake.refunds.at(-1)).toMatchObject({ amount: r.price.totalMinor });
  });

  it('paying back · paid twice through two checkouts · the second payment is refunded, the first stays', async () => {
    const r = await ask({ quantity: 1 });
    await owner.post(`/api/print-requests/${r.id}/accept`).send({}).expect(200);
    const first = await asker.post(`/api/print-requests/${r.id}/checkout`).send({}).expect(200);
    const second = await asker.post(`/api/print-requests/${r.id}/checkout`).send({}).expect(200);
    expect((await fake.pay(sessionOf(first.body.url))).answered).toBe(200);
    const refunds = fake.refunds.length;
    expect((await fake.pay(sessionOf(second.body.url))).answered).toBe(200);
    const after = await read(r.id);
    expect(after.payment).toMatchObject({ status: 'paid', paidMinor: r.price.totalMinor });
    expect(fake.refunds.length).toBe(refunds + 1);
    expect(fake.refunds.at(-1)).toMatchObject({ payment_intent: fake.sessions.get(sessionOf(second.body.url))!.payment_intent, amount: r.price.totalMinor });
    expect(after.history.at(-1)!.action).toBe('refunded-extra');
  });

  it('paying back · totals · owners see owed and paid, requesters what they paid', async () => {
    const paid = await acceptedAndPaid();
    const list = (await owner.get('/api/print-requests').expect(200)).body as PrintRequestList;
    const paidToOwner = await PrintRequest.sum('paidMinor', { where: { ownerId: owner.userId, paymentStatus: 'paid' } });
    expect(list.totals.paidToMe).toEqual([{ currency: 'EUR', minor: paidToOwner }]);
    const owed = (await PrintRequest.findAll({ where: { ownerId: owner.userId } })).filter(
      (r) => ['accepted', 'fit_tested', 'printed', 'handed_over'].includes(r.status) && r.paymentStatus !== 'paid',
    );
    expect(list.totals.owedToMe).toEqual([{ currency: 'EUR', minor: owed.reduce((s, r) => s + r.priceMinor!, 0) }]);
    expect(list.forMe.some((r) => r.id === paid.id)).toBe(true);
    const mine = (await asker.get('/api/print-requests').expect(200)).body as PrintRequestList;
    expect(mine.totals.iPaid).toEqual([{ currency: 'EUR', minor: paidToOwner }]);
    expect(mine.forMe).toEqual([]);
    expect(JSON.stringify(mine)).not.toMatch(/card|4242/i);
  });
});

describe('statement · a kit for the production office', () => {
  let kitId: number;
  beforeAll(async () => {
    const kit = await asker.post('/api/kits').send({ name: 'Night exteriors', production: 'The Lighthouse Keeper' });
    kitId = kit.body.id;
    await asker.post(`/api/kits/${kitId}/items`).send({ partId: cubePart, quantity: 3 }).expect(201);
    await asker.post(`/api/kits/${kitId}/items`).send({ partId: ncPart, quantity: 2 }).expect(201);
    await asker.agent
      .put('/api/me/prices')
      .set('X-CSRF-Token', asker.token)
      .send({ prices: { PLA: 19.99 }, pricePerKwh: 0.3 })
      .expect(200);
    await asker.agent
      .put(`/api/kits/${kitId}/statement`)
      .set('X-CSRF-Token', asker.token)
      .send({
        purchaseOrder: 'PO-2291',
        fees: [
          { label: 'Prep-day handling', amount: 12.5 },
          { label: 'Courier', amount: 7.35 },
        ],
      })
      .expect(204);
  });

  it('statement · JSON · lines add up to the subtotal, tax once at the crew rate, total to the cent', async () => {
    const s = (await asker.get(`/api/kits/${kitId}/statement`).expect(200)).body as StatementInfo;
    expect(s.currency).toBe('EUR');
    expect(s.purchaseOrder).toBe('PO-2291');
    expect(s.lines.map((l) => l.kind)).toEqual(['item', 'item', 'fee', 'fee']);
    // by hand: the cube line is 29.8 g × 19.99 /kg = 0.595702 → 0.60
    expect(s.lines[0].grams).toBe(29.8);
    expect(s.lines[0].filamentMinor).toBe(60);
    expect(s.lines[2].amountMinor).toBe(1250);
    expect(s.lines[3].amountMinor).toBe(735);
    expect(s.subtotalMinor).toBe(s.lines.reduce((sum, l) => sum + l.amountMinor, 0));
    // 19 % of the subtotal, rounded half up once (common practice for invoice-level VAT)
    expect(s.taxMinor).toBe(Math.round((s.subtotalMinor * 19) / 100));
    expect(s.totalMinor).toBe(s.subtotalMinor + s.taxMinor);
  });

  it('statement · a part under CC BY-NC · flagged with the licence named and a suggestion to ask the author', async () => {
    const s = (await asker.get(`/api/kits/${kitId}/statement`).expect(200)).body as StatementInfo;
    expect(s.lines[0].caution).toBeNull();
    expect(s.lines[1].caution).toMatch(/CC BY-NC 4\.0/);
    expect(s.lines[1].caution).toMatch(/Creative Commons Attribution Non Commercial 4\.0 International/);
    expect(s.lines[1].caution).toMatch(/Ask the author, Test member \d+, for permission/);
    expect(s.cautions).toHaveLength(1);
  });

  it('statement · CSV · the amount column adds up to the total to the cent', async () => {
    const res = await asker.get(`/api/kits/${kitId}/statement.csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/night-exteriors-statement\.csv/);
    const rows = Papa.parse<string[]>(res.text.replace(/^\ufeff/, '')).data;
    const header = rows.findIndex((r) => r[0] === 'Line');
    const amount = rows[header].indexOf('Amount');
    const cents = (text: string) => Math.round(Number(text) * 100);
    const lineRows = rows.slice(header + 1).filter((r) => r[0] && !['Subtotal', 'Total', 'Note'].includes(r[0]) && !r[0].startsWith('Tax'));
    expect(lineRows).toHaveLength(4);
    const subtotal = rows.find((r) => r[0] === 'Subtotal')!;
    const tax = rows.find((r) => r[0]?.startsWith('Tax'))!;
    const total = rows.find((r) => r[0] === 'Total')!;
    expect(lineRows.reduce((s, r) => s + cents(r[amount]), 0)).toBe(cents(subtotal[amount]));
    expect(cents(subtotal[amount]) + cents(tax[amount])).toBe(cents(total[amount]));
    expect(lineRows[1][rows[header].indexOf('Caution')]).toMatch(/non-commercial/);
    expect(rows.find((r) => r[0] === 'Purchase order')![1]).toBe('PO-2291');
  });

  it('statement · PDF · a PDF document; outsiders get 404', async () => {
    const res = await asker
      .get(`/api/kits/${kitId}/statement.pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect((res.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    expect((res.body as Buffer).length).toBeGreaterThan(2000);
    await outsider.get(`/api/kits/${kitId}/statement.pdf`).expect(404);
    await outsider.get(`/api/kits/${kitId}/statement.csv`).expect(404);
  });

  it('statement · bad details · 422 and the saved details stay', async () => {
    const res = await asker.agent
      .put(`/api/kits/${kitId}/statement`)
      .set('X-CSRF-Token', asker.token)
      .send({ fees: [{ label: '', amount: -1 }] });
    expect(res.status).toBe(422);
    const s = (await asker.get(`/api/kits/${kitId}/statement`).expect(200)).body as StatementInfo;
    expect(s.fees).toHaveLength(2);
  });
});
