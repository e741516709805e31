// Print requests between crew members: a member asks a crew mate with a printer to print a shelf part
// or a whole kit; the owner accepts (the price freezes) or declines, then marks the fit test, the
// print and the hand-over; the requester may cancel until printing starts. Every step is on record
// with who and when, and the other side gets a notice and a mail. Paying back goes through the
// payments SDK: a request is paid only when a verified webhook says so, each event id once.
import { Op, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import type Stripe from 'stripe';
import type { CrewPrinter, MoneyByCurrency, PrintRequestDetail, PrintRequestInfo, PrintRequestList } from '@shared/api/print-requests';
import type { MaterialId } from '@shared/materials';
import { computePrintPrice, sumMinor, type PrintPrice } from '@shared/print-price';
import {
  allowedPrintActions,
  canPay,
  isOwed,
  printTransition,
  refundDue,
  STATE_LABELS,
  type PrintRequestAction,
  type PrintRequestRole,
  type PrintRequestState,
} from '@shared/print-requests';
import type { PrintRequestInput } from '@shared/schemas/print-requests';
import {
  Crew,
  CrewMember,
  Part,
  PartFile,
  PartRevision,
  PaymentEvent,
  PriceSheet,
  Printer,
  PrintRequest,
  PrintRequestEvent,
  Recipe,
  User,
} from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { membershipOf } from '../crews/service';
import type { Mailer } from '../mail/outbox';
import { mailTemplates } from '../mail/templates';
import { notices } from '../notices/service';
import { findVisiblePart } from '../parts/access';
import type { PlanningService } from '../planning/service';
import { effectivePrices } from '../planning/presenter';
import type { Payments } from '../payments/client';

export interface PrintRequestsDeps {
  sequelize: Sequelize;
  mail: Mailer;
  publicUrl: string;
  planning: Pick<PlanningService, 'estimate' | 'summary'>;
  payments: Payments;
}

const notFound = () => AppError.notFound('There is no print request with that id among yours.');

function person(user: User | undefined, id: number) {
  return { id, displayName: user?.displayName ?? 'A former member' };
}

type FileWithPosition = PartFile & { RevisionFile?: { position: number } };

/** What happens at each step, in the words the other side reads. */
const STEP_WORDS: Record<PrintRequestAction | 'asked' | 'paid' | 'refunded', { to: PrintRequestRole; subject: string; text: (actor: string, title: string) => string }> = {
  asked: { to: 'owner', subject: 'A print request for you', text: (a, t) => `${a} asks you to print “${t}”. Look at the estimate and the price, then accept or decline it.` },
  accept: { to: 'requester', subject: 'Your print request was accepted', text: (a, t) => `${a} accepted your request for “${t}”. The price is frozen now; you can pay it back from the request.` },
  decline: { to: 'requester', subject: 'Your print request was declined', text: (a, t) => `${a} declined your request for “${t}”. Anything you paid is refunded.` },
  cancel: { to: 'owner', subject: 'A print request was cancelled', text: (a, t) => `${a} cancelled the request for “${t}”. There is nothing more to print for it.` },
  'fit-tested': { to: 'requester', subject: 'Fit test printed', text: (a, t) => `${a} printed a fit test of “${t}”. Check it on the rig if you can.` },
  printed: { to: 'requester', subject: 'Your print is ready', text: (a, t) => `${a} printed “${t}”. Arrange the hand-over.` },
  'handed-over': { to: 'requester', subject: 'Print handed over', text: (a, t) => `${a} marked “${t}” as handed over to you.` },
  paid: { to: 'owner', subject: 'A print was paid back', text: (a, t) => `${a} paid back the print of “${t}”.` },
  refunded: { to: 'requester', subject: 'Your payment was refunded', text: (_a, t) => `What you paid for “${t}” was refunded to you.` },
};

export function createPrintRequestsService({ sequelize, mail, publicUrl: configuredUrl, planning, payments }: PrintRequestsDeps) {
  let publicUrl = configuredUrl;
  const link = (id: number) => `/print-requests/${id}`;

  async function ownerTerms(ownerId: number, transaction?: Transaction) {
    const sheet = await PriceSheet.findByPk(ownerId, { transaction });
    return { pricesPerKg: effectivePrices(sheet) as Record<string, number>, pricePerKwh: sheet?.pricePerKwh ?? null, machineHourRate: sheet?.machineHourRate ?? null };
  }

  async function priceOf(r: PrintRequest, transaction?: Transaction): Promise<PrintPrice> {
    if (r.frozenPrice) return r.frozenPrice;
    return computePrintPrice({ filament: r.filament, minutes: r.minutes, watts: r.printerWatts }, await ownerTerms(r.ownerId, transaction), r.currency);
  }

  async function present(r: PrintRequest, viewer: User): Promise<PrintRequestInfo> {
    const role: PrintRequestRole = r.ownerId === viewer.id ? 'owner' : 'requester';
    const crew = r.crewId ? await Crew.findByPk(r.crewId) : null;
    let part: { id: number; slug: string } | null = null;
    if (r.partId) {
      const p = await findVisiblePart(viewer, r.partId).catch(() => null);
      part = p ? { id: p.id, slug: p.slug } : null;
    }
    return {
      id: r.id,
      kind: r.kind,
      title: r.title,
      part,
      kitId: r.kitId,
      quantity: r.quantity,
      material: r.material,
      neededBy: r.neededBy,
      note: r.note,
      crew: crew ? { id: crew.id, name: crew.name } : null,
      printer: { id: r.printerId, name: r.printerName, watts: r.printerWatts },
      requester: person(r.requester, r.requesterId),
      owner: person(r.owner, r.ownerId),
      status: r.status,
      role,
      actions: allowedPrintActions(r.status, role),
      estimate: { grams: r.grams, minutes: r.minutes, filament: r.filament, notes: r.estimateNotes },
      price: await priceOf(r),
      priceFrozen: r.frozenPrice !== null,
      payment: {
        status: r.paymentStatus,
        paidMinor: r.paidMinor,
        paidAt: r.paidAt?.toISOString() ?? null,
        refundedAt: r.refundedAt?.toISOString() ?? null,
        canPay: role === 'requester' && canPay(r.status, r.paymentStatus),
      },
      createdAt: r.createdAt.toISOString(),
      updatedAt: r.updatedAt.toISOString(),
    };
  }

  const withPeople = [
    { model: User, as: 'requester' },
    { model: User, as: 'owner' },
  ];

  async function visible(viewer: User, id: number, transaction?: Transaction): Promise<PrintRequest> {
    const r = await PrintRequest.findByPk(id, { transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
    if (!r || (r.requesterId !== viewer.id && r.ownerId !== viewer.id)) throw notFound();
    return r;
  }

  async function loadDetail(viewer: User, id: number): Promise<PrintRequestDetail> {
    const r = await PrintRequest.findByPk(id, { include: withPeople });
    if (!r || (r.requesterId !== viewer.id && r.ownerId !== viewer.id)) throw notFound();
    const events = await PrintRequestEvent.findAll({ where: { requestId: r.id }, include: [{ model: User, as: 'actor' }], order: [['id', 'ASC']] });
    return {
      ...(await present(r, viewer)),
      history: events.map((e) => ({
        action: e.action,
        from: e.fromStatus,
        to: e.toStatus,
        actor: e.actorId ? person(e.actor, e.actorId) : null,
        note: (e.details?.note as string | undefined) ?? null,
        at: e.createdAt.toISOString(),
      })),
    };
  }

  /** The record, a notice and a mail for the other side, all inside `t`. */
  async function record(
    r: PrintRequest,
    step: keyof typeof STEP_WORDS,
    actor: User | null,
    from: string | null,
    details: Record<string, unknown> | null,
    t: Transaction,
  ) {
    await PrintRequestEvent.create({ requestId: r.id, actorId: actor?.id ?? null, action: step, fromStatus: from, toStatus: r.status, details }, { transaction: t });
    const words = STEP_WORDS[step];
    const toId = words.to === 'owner' ? r.ownerId : r.requesterId;
    const to = await User.findByPk(toId, { transaction: t });
    if (!to) return;
    const actorName = actor?.displayName ?? (step === 'paid' ? (await User.findByPk(r.requesterId, { transaction: t }))?.displayName ?? 'The requester' : 'Rigshelf');
    const text = words.text(actorName, r.title);
    await notices.notify([to.id], { kind: 'print-request', title: `${words.subject}: ${r.title}`, body: text, link: link(r.id) }, t);
    await mail.enqueue(
      to.email,
      mailTemplates.printRequestStep({
        subject: `${words.subject}: ${r.title}`,
        heading: words.subject,
        text,
        note: typeof details?.note === 'string' ? details.note : null,
        noteBy: actorName,
        link: `${publicUrl}${link(r.id)}`,
      }),
      t,
    );
  }

  /** Refunds a request whose refund is due, once (the idempotency key holds across retries). */
  async function settleRefund(id: number): Promise<void> {
    const r = await PrintRequest.findByPk(id);
    if (!r || r.paymentStatus !== 'refund_due' || !r.paymentRef) return;
    let refund: { id: string; status: string | null };
    try {
      refund = await payments.refund(r.paymentRef, `rigshelf-refund-${r.id}-${r.paymentRef}`);
    } catch (err) {
      console.error(`rigshelf: refund of print request ${r.id} failed, will retry at start-up: ${(err as Error).message}`);
      return;
    }
    await transact(sequelize, async (t) => {
      const locked = await PrintRequest.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
      if (!locked || locked.paymentStatus !== 'refund_due') return;
      await locked.update({ paymentStatus: 'refunded', refundRef: refund.id, refundedAt: new Date() }, { transaction: t });
      await record(locked, 'refunded', null, locked.status, { refund: refund.id, amountMinor: locked.paidMinor, currency: locked.currency }, t);
    });
  }

  /** A second payment for a request already paid is refunded in full (the key holds across retries). */
  async function refundExtra(x: { requestId: number; paymentRef: string; amountMinor: number }) {
    try {
      const refund = await payments.refund(x.paymentRef, `rigshelf-refund-extra-${x.paymentRef}`);
      await transact(sequelize, async (t) => {
        const r = await PrintRequest.findByPk(x.requestId, { transaction: t });
        if (!r) return;
        await PrintRequestEvent.create(
          { requestId: r.id, actorId: null, action: 'refunded-extra', fromStatus: r.status, toStatus: r.status, details: { refund: refund.id, amountMinor: x.amountMinor, currency: r.currency } },
          { transaction: t },
        );
      });
    } catch (err) {
      console.error(`rigshelf: refund of a second payment for print request ${x.requestId} failed: ${(err as Error).message}`);
    }
  }

  async function estimateFor(viewer: User, input: PrintRequestInput) {
    if (input.partId !== undefined) {
      const part = await findVisiblePart(viewer, input.partId).catch(() => null);
      if (!part || part.status !== 'published' || !part.publishedRevisionId) {
        throw AppError.field('partId', 'Only parts on the shelf can be asked for; pick one from the shelf.');
      }
      // a crew-only part stays inside its crew: the printer's owner must be in it too
      if (part.crewId && part.crewId !== input.crewId) {
        throw AppError.field('crewId', 'This part is published to one crew only; ask a member of that crew to print it.');
      }
      const revision = await PartRevision.findByPk(part.publishedRevisionId, { include: [{ model: PartFile, as: 'files', through: { attributes: ['position'] } }] });
      const recipes = await Recipe.findAll({ where: { revisionId: part.publishedRevisionId }, order: [['position', 'ASC']] });
      const recipe = input.recipeId ? recipes.find((x) => x.id === input.recipeId) : (recipes.find((x) => x.purpose === 'set-ready') ?? recipes[0]);
      if (!recipe) throw AppError.field('recipeId', input.recipeId ? 'That recipe is not one of this part’s published recipes.' : 'This part has no published recipe to print it with.');
      const files = [...((revision?.files ?? []) as FileWithPosition[])].sort((a, b) => (a.RevisionFile?.position ?? 0) - (b.RevisionFile?.position ?? 0));
      const model = files.find((f) => f.kind === 'model' && f.analysis && f.analysis.volumeMm3 > 0);
      if (!model) throw AppError.field('partId', 'This part has no analysed model file, so there is nothing to estimate the print from.');
      const material = (input.material ?? recipe.material) as MaterialId;
      const e = await planning.estimate(viewer, {
        fileId: model.id,
        material,
        nozzleMm: recipe.nozzleMm,
        layerMm: recipe.layerMm,
        walls: recipe.walls,
        topBottomLayers: recipe.topBottomLayers,
        infillPct: recipe.infillPct,
        speedMmS: recipe.speedMmS,
      });
      const grams = e.massG * input.quantity;
      return {
        kind: 'part' as const,
        partId: part.id,
        recipeId: recipe.id,
        kitId: null,
        title: revision?.title ?? part.slug,
        material,
        filament: [{ material, grams }],
        grams,
        minutes: e.timeMin * input.quantity,
        notes: [`Estimated from ${model.originalName} with its ${recipe.purpose} recipe (${recipe.material}, ${recipe.layerMm} mm layers, ${recipe.infillPct} % infill), ${input.quantity} × one piece.`, ...e.assumptions.filter((a) => !/price/i.test(a))],
      };
    }
    const summary = await planning.summary(viewer, input.kitId!);
    const itemParts = summary.items.length ? await Part.findAll({ where: { id: { [Op.in]: summary.items.flatMap((i) => (i.part ? [i.part.id] : [])) } }, attributes: ['id', 'crewId'] }) : [];
    if (itemParts.some((p) => p.crewId && p.crewId !== input.crewId)) {
      throw AppError.field('crewId', 'This kit holds parts published to another crew only; ask a member of that crew, or take those items out first.');
    }
    const byMaterial = new Map<string, number>();
    let minutes = 0;
    const notes: string[] = [];
    for (const item of summary.items) {
      if (!item.total) {
        notes.push(`${item.title} has no estimate and is not priced.`);
        continue;
      }
      byMaterial.set(item.material, (byMaterial.get(item.material) ?? 0) + item.total.massG * input.quantity);
      minutes += item.total.hours * 60 * input.quantity;
    }
    if (!byMaterial.size) throw AppError.field('kitId', 'No item of this kit has an estimate, so there is nothing to price; add parts with model files first.');
    const filament = [...byMaterial].map(([material, grams]) => ({ material, grams }));
    return {
      kind: 'kit' as const,
      partId: null,
      recipeId: null,
      kitId: summary.kit.id,
      title: `Kit: ${summary.kit.name}`,
      material: filament.length === 1 ? filament[0].material : 'mixed',
      filament,
      grams: filament.reduce((s, f) => s + f.grams, 0),
      minutes,
      notes: [
        `Estimated from the kit’s ${summary.items.length} item(s) with each item’s recipe${input.quantity > 1 ? `, ${input.quantity} times over` : ''}.`,
        `Items: ${summary.items.map((i) => `${i.quantity * input.quantity} × ${i.title} (${i.material})`).join('; ')}.`,
        ...notes,
      ],
    };
  }

  function totalsBy(rows: { currency: string; minor: number }[]): MoneyByCurrency[] {
    const by = new Map<string, number[]>();
    for (const r of rows) if (r.minor) by.set(r.currency, [...(by.get(r.currency) ?? []), r.minor]);
    return [...by].map(([currency, amounts]) => ({ currency, minor: sumMinor(amounts, currency) })).sort((a, b) => a.currency.localeCompare(b.currency));
  }

  return {
    /** Printers of the viewer's crew mates, once per crew they share. */
    async printers(viewer: User): Promise<CrewPrinter[]> {
      const mine = await CrewMember.findAll({ where: { userId: viewer.id }, include: [{ model: Crew, as: 'crew' }] });
      if (!mine.length) return [];
      const mates = await CrewMember.findAll({ where: { crewId: { [Op.in]: mine.map((m) => m.crewId) }, userId: { [Op.ne]: viewer.id } }, include: [{ model: User, as: 'user' }] });
      const active = mates.filter((m) => m.user && m.user.status === 'active');
      if (!active.length) return [];
      const printers = await Printer.findAll({ where: { ownerId: { [Op.in]: [...new Set(active.map((m) => m.userId))] } }, order: [['name', 'ASC'], ['id', 'ASC']] });
      const out: CrewPrinter[] = [];
      for (const m of active) {
        const crew = mine.find((c) => c.crewId === m.crewId)!.crew!;
        for (const p of printers.filter((x) => x.ownerId === m.userId)) {
          out.push({ id: p.id, name: p.name, watts: p.watts, nozzleMm: p.nozzleMm, bedMm: p.bedMm(), owner: person(m.user, m.userId), crew: { id: crew.id, name: crew.name, currency: crew.currency } });
        }
      }
      return out.sort((a, b) => a.crew.name.localeCompare(b.crew.name) || a.owner.displayName.localeCompare(b.owner.displayName) || a.name.localeCompare(b.name));
    },

    async list(viewer: User): Promise<PrintRequestList> {
      const rows = await PrintRequest.findAll({
        where: { [Op.or]: [{ ownerId: viewer.id }, { requesterId: viewer.id }] },
        include: withPeople,
        order: [['updatedAt', 'DESC'], ['id', 'DESC']],
        limit: 500,
      });
      const forMe = rows.filter((r) => r.ownerId === viewer.id);
      const mine = rows.filter((r) => r.requesterId === viewer.id);
      const kept = (r: PrintRequest) => (r.paymentStatus === 'paid' ? r.paidMinor : 0);
      return {
        forMe: await Promise.all(forMe.map((r) => present(r, viewer))),
        mine: await Promise.all(mine.map((r) => present(r, viewer))),
        totals: {
          owedToMe: totalsBy(forMe.filter((r) => isOwed(r.status, r.paymentStatus)).map((r) => ({ currency: r.currency, minor: r.frozenPrice?.totalMinor ?? 0 }))),
          paidToMe: totalsBy(forMe.map((r) => ({ currency: r.currency, minor: kept(r) }))),
          iPaid: totalsBy(mine.map((r) => ({ currency: r.currency, minor: kept(r) }))),
        },
      };
    },

    get: loadDetail,

    async create(viewer: User, input: PrintRequestInput): Promise<PrintRequestDetail> {
      const crew = await Crew.findByPk(input.crewId);
      if (!crew || !(await membershipOf(viewer.id, crew.id))) throw AppError.field('crewId', 'You are not in that crew; ask a member of one of your crews.');
      const printer = await Printer.findByPk(input.printerId);
      const owner = printer ? await User.findByPk(printer.ownerId) : null;
      if (!printer || !owner || owner.status !== 'active' || !(await membershipOf(owner.id, crew.id))) {
        throw AppError.field('printerId', 'That printer does not belong to a member of this crew; pick one from the crew’s printers.');
      }
      if (owner.id === viewer.id) throw AppError.field('printerId', 'That is your own printer; print it yourself, or ask a crew mate.');
      const e = await estimateFor(viewer, input);
      const id = await transact(sequelize, async (t) => {
        const r = await PrintRequest.create(
          {
            requesterId: viewer.id,
            ownerId: owner.id,
            printerId: printer.id,
            printerName: printer.name,
            printerWatts: printer.watts,
            crewId: crew.id,
            kind: e.kind,
            partId: e.partId,
            recipeId: e.recipeId,
            kitId: e.kitId,
            title: e.title.slice(0, 200),
            quantity: input.quantity,
            material: e.material,
            neededBy: input.neededBy ?? null,
            note: input.note?.trim() ? input.note.trim() : null,
            filament: e.filament.map((f) => ({ material: f.material, grams: Math.round(f.grams * 10) / 10 })),
            grams: Math.round(e.grams * 10) / 10,
            minutes: Math.round(e.minutes * 10) / 10,
            estimateNotes: e.notes,
            currency: crew.currency,
            priceMinor: null,
            frozenPrice: null,
            pricedAt: null,
            checkoutId: null,
            paymentRef: null,
            paidAt: null,
            refundRef: null,
            refundedAt: null,
          },
          { transaction: t },
        );
        await record(r, 'asked', viewer, null, r.note ? { note: r.note } : null, t);
        return r.id;
      });
      return loadDetail(viewer, id);
    },

    async step(viewer: User, id: number, action: PrintRequestAction, note: string | null | undefined): Promise<PrintRequestDetail> {
      const refund = await transact(sequelize, async (t) => {
        const r = await visible(viewer, id, t);
        const role: PrintRequestRole = r.ownerId === viewer.id ? 'owner' : 'requester';
        const result = printTransition(r.status, action, role);
        if (!result.ok) throw new AppError(result.status, result.status === 403 ? 'forbidden' : 'conflict', result.message);
        const from = r.status;
        const changes: Partial<PrintRequest> = { status: result.to };
        if (action === 'accept') {
          const price = await priceOf(r, t);
          changes.frozenPrice = price;
          changes.priceMinor = price.totalMinor;
          changes.pricedAt = new Date();
        }
        if (refundDue(result.to, r.paymentStatus)) changes.paymentStatus = 'refund_due';
        await r.update(changes, { transaction: t });
        const details: Record<string, unknown> = {};
        if (note?.trim()) details.note = note.trim();
        if (action === 'accept') Object.assign(details, { priceMinor: r.priceMinor, currency: r.currency });
        await record(r, action, viewer, from, Object.keys(details).length ? details : null, t);
        return r.paymentStatus === 'refund_due';
      });
      if (refund) await settleRefund(id);
      return loadDetail(viewer, id);
    },

    async checkout(viewer: User, id: number): Promise<{ url: string | null; clientSecret: string | null }> {
      const r = await visible(viewer, id);
      if (r.requesterId !== viewer.id) throw AppError.forbidden('Only the member who asked pays a print back.');
      if (!canPay(r.status, r.paymentStatus)) {
        throw AppError.conflict(
          r.paymentStatus === 'paid' || r.paymentStatus === 'refunded' || r.paymentStatus === 'refund_due'
            ? 'This request is paid already.'
            : `This request is ${STATE_LABELS[r.status as PrintRequestState].toLowerCase()}; it can be paid once the printer’s owner accepts it.`,
        );
      }
      const session = await payments.createCheckout({
        requestId: r.id,
        title: `Print: ${r.title} (${r.quantity} ×, ${r.printerName})`,
        amountMinor: r.priceMinor!,
        currency: r.currency,
        successUrl: `${publicUrl}${link(r.id)}?paid=1`,
        cancelUrl: `${publicUrl}${link(r.id)}`,
      });
      await transact(sequelize, async (t) => {
        const locked = await visible(viewer, id, t);
        if (locked.paymentStatus === 'unpaid' || locked.paymentStatus === 'pending') {
          await locked.update({ paymentStatus: 'pending', checkoutId: session.id }, { transaction: t });
          await PrintRequestEvent.create({ requestId: r.id, actorId: viewer.id, action: 'checkout', fromStatus: r.status, toStatus: r.status, details: { checkout: session.id } }, { transaction: t });
        }
      });
      return { url: session.url, clientSecret: session.clientSecret };
    },

    /**
     * A webhook from the payments service. Verified with the SDK or refused (400, nothing changes);
     * each event id is taken in once; a payment for a request that ended is refunded.
     */
    async webhook(rawBody: Buffer, signature: string | undefined): Promise<{ received: true; duplicate?: true }> {
      let event: Stripe.Event;
      try {
        event = payments.verify(rawBody, signature);
      } catch {
        throw new AppError(400, 'bad_signature', 'The webhook signature does not verify; nothing was changed.');
      }
      let refundId: number | null | 'duplicate' = null;
      let extra: { requestId: number; paymentRef: string; amountMinor: number } | null = null;
      try {
        refundId = await transact(sequelize, async (t) => {
          if (await PaymentEvent.findByPk(event.id, { transaction: t })) return 'duplicate' as const;
          const taken = { eventId: event.id, type: event.type, requestId: null as number | null, outcome: 'ignored' };
          let due: number | null = null;
          if (event.type === 'checkout.session.completed') {
            const s = event.data.object as Stripe.Checkout.Session;
            const requestId = Number(s.metadata?.printRequestId ?? s.client_reference_id);
            const r = Number.isInteger(requestId) && requestId > 0 ? await PrintRequest.findByPk(requestId, { transaction: t, lock: t.LOCK.UPDATE }) : null;
            const paymentRef = typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null);
            taken.requestId = r?.id ?? null;
            if (!r) taken.outcome = 'unknown_request';
            else if (s.payment_status !== 'paid' || !paymentRef) taken.outcome = 'not_paid';
            else if (r.priceMinor === null || s.amount_total !== r.priceMinor || s.currency?.toUpperCase() !== r.currency) taken.outcome = 'amount_mismatch';
            else if (r.paymentStatus === 'paid' || r.paymentStatus === 'refund_due' || r.paymentStatus === 'refunded') {
              taken.outcome = r.paymentRef === paymentRef ? 'already_paid' : 'second_payment';
              // paid twice through two checkouts: the later payment goes back
              if (taken.outcome === 'second_payment') extra = { requestId: r.id, paymentRef, amountMinor: s.amount_total ?? 0 };
            } else {
              const from = r.status;
              const settled = refundDue(r.status, 'paid') ? ('refund_due' as const) : ('paid' as const);
              await r.update(
                { paymentStatus: settled, paidMinor: s.amount_total!, paymentRef, paidAt: new Date(), checkoutId: s.id },
                { transaction: t },
              );
              await record(r, 'paid', null, from, { amountMinor: s.amount_total, currency: r.currency, event: event.id }, t);
              taken.outcome = 'paid';
              if (settled === 'refund_due') due = r.id;
            }
          }
          await PaymentEvent.create(taken, { transaction: t });
          return due;
        });
      } catch (err) {
        if (err instanceof UniqueConstraintError) return { received: true, duplicate: true };
        throw err;
      }
      if (refundId === 'duplicate') return { received: true, duplicate: true };
      if (refundId) await settleRefund(refundId);
      if (extra) await refundExtra(extra);
      return { received: true };
    },

    /** Links in mails and the payment page's way back start here (set once a free port is known). */
    useBaseUrl(url: string) {
      publicUrl = url.replace(/\/+$/, '');
    },

    /** At start-up: refunds that were due when the service last stopped. */
    async resumeRefunds(): Promise<number> {
      const due = await PrintRequest.findAll({ where: { paymentStatus: 'refund_due' }, attributes: ['id'] });
      for (const r of due) await settleRefund(r.id);
      return due.length;
    },
  };
}

export type PrintRequestsService = ReturnType<typeof createPrintRequestsService>;

