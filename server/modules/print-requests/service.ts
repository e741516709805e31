// Over 350 lines: the request's steps share one state table (STEP_WORDS) and one notify-both-sides
// path; estimate.ts and paying-back.ts are already apart.
// Print requests between crew members: a member asks a crew mate with a printer to print a shelf part
// or a whole kit; the owner accepts (the price freezes) or declines, then marks the fit test, the
// print and the hand-over; the requester may cancel until printing starts. Every step is on record
// with who and when, and the other side gets a notice and a mail. Paying back goes through the
// payments SDK (paying-back.ts): a request is paid only when a verified webhook says so, each event id once.
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { CrewPrinter, MoneyByCurrency, PrintRequestDetail, PrintRequestInfo, PrintRequestList } from '@shared/api/print-requests';
import { computePrintPrice, sumMinor, type PrintPrice } from '@shared/print-price';
import { allowedPrintActions, canPay, isOwed, printTransition, refundDue, type PrintRequestAction, type PrintRequestRole } from '@shared/print-requests';
import type { PrintRequestInput } from '@shared/schemas/print-requests';
import { Crew, CrewMember, PriceSheet, Printer, PrintRequest, PrintRequestEvent, User } from '../../db/models';
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
import { estimateRequest } from './estimate';
import { payingBack } from './paying-back';

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

/** What happens at each step, in the words the other side reads. */
const STEP_WORDS: Record<
  PrintRequestAction | 'asked' | 'paid' | 'refunded',
  { to: PrintRequestRole; subject: string; text: (actor: string, title: string) => string }
> = {
  asked: {
    to: 'owner',
    subject: 'A print request for you',
    text: (a, t) => `${a} asks you to print “${t}”. Look at the estimate and the price, then accept or decline it.`,
  },
  accept: {
    to: 'requester',
    subject: 'Your print request was accepted',
    text: (a, t) => `${a} accepted your request for “${t}”. The price is frozen now; you can pay it back from the request.`,
  },
  decline: {
    to: 'requester',
    subject: 'Your print request was declined',
    text: (a, t) => `${a} declined your request for “${t}”. Anything you paid is refunded.`,
  },
  cancel: {
    to: 'owner',
    subject: 'A print request was cancelled',
    text: (a, t) => `${a} cancelled the request for “${t}”. There is nothing more to print for it.`,
  },
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
    return {
      pricesPerKg: effectivePrices(sheet) as Record<string, number>,
      pricePerKwh: sheet?.pricePerKwh ?? null,
      machineHourRate: sheet?.machineHourRate ?? null,
    };
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
    await PrintRequestEvent.create(
      { requestId: r.id, actorId: actor?.id ?? null, action: step, fromStatus: from, toStatus: r.status, details },
      { transaction: t },
    );
    const words = STEP_WORDS[step];
    const toId = words.to === 'owner' ? r.ownerId : r.requesterId;
    const to = await User.findByPk(toId, { transaction: t });
    if (!to) return;
    const actorName =
      actor?.displayName ?? (step === 'paid' ? ((await User.findByPk(r.requesterId, { transaction: t }))?.displayName ?? 'The requester') : 'Rigshelf');
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

  const paying = payingBack({ sequelize, payments, record, visible, link, publicUrl: () => publicUrl });

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
      const mates = await CrewMember.findAll({
        where: { crewId: { [Op.in]: mine.map((m) => m.crewId) }, userId: { [Op.ne]: viewer.id } },
        include: [{ model: User, as: 'user' }],
      });
      const active = mates.filter((m) => m.user && m.user.status === 'active');
      if (!active.length) return [];
      const printers = await Printer.findAll({
        where: { ownerId: { [Op.in]: [...new Set(active.map((m) => m.userId))] } },
        order: [
          ['name', 'ASC'],
          ['id', 'ASC'],
        ],
      });
      const out: CrewPrinter[] = [];
      for (const m of active) {
        const crew = mine.find((c) => c.crewId === m.crewId)!.crew!;
        for (const p of printers.filter((x) => x.ownerId === m.userId)) {
          out.push({
            id: p.id,
            name: p.name,
            watts: p.watts,
            nozzleMm: p.nozzleMm,
            bedMm: p.bedMm(),
            owner: person(m.user, m.userId),
            crew: { id: crew.id, name: crew.name, currency: crew.currency },
          });
        }
      }
      return out.sort(
        (a, b) => a.crew.name.localeCompare(b.crew.name) || a.owner.displayName.localeCompare(b.owner.displayName) || a.name.localeCompare(b.name),
      );
    },

    async list(viewer: User): Promise<PrintRequestList> {
      const rows = await PrintRequest.findAll({
        where: { [Op.or]: [{ ownerId: viewer.id }, { requesterId: viewer.id }] },
        include: withPeople,
        order: [
          ['updatedAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: 500,
      });
      const forMe = rows.filter((r) => r.ownerId === viewer.id);
      const mine = rows.filter((r) => r.requesterId === viewer.id);
      const kept = (r: PrintRequest) => (r.paymentStatus === 'paid' ? r.paidMinor : 0);
      return {
        forMe: await Promise.all(forMe.map((r) => present(r, viewer))),
        mine: await Promise.all(mine.map((r) => present(r, viewer))),
        totals: {
          owedToMe: totalsBy(
            forMe.filter((r) => isOwed(r.status, r.paymentStatus)).map((r) => ({ currency: r.currency, minor: r.frozenPrice?.totalMinor ?? 0 })),
          ),
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
      const e = await estimateRequest(planning, viewer, input);
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
      if (refund) await paying.settleRefund(id);
      return loadDetail(viewer, id);
    },

    /** Links in mails and the payment page's way back start here (set once a free port is known). */
    useBaseUrl(url: string) {
      publicUrl = url.replace(/\/+$/, '');
    },

    checkout: paying.checkout,
    webhook: paying.webhook,
    resumeRefunds: paying.resumeRefunds,
  };
}

export type PrintRequestsService = ReturnType<typeof createPrintRequestsService>;
