// The review desk: nothing reaches the shelf unreviewed, and every decision is on record.
import { Op, type Sequelize, type Transaction } from 'sequelize';
import { meshConcerns } from '@shared/mesh/concerns';
import { checkAdaptationLicence, isLicenceId } from '@shared/licences';
import { allowedActions, NOTE_REQUIRED, REVIEW_CHECKLIST, transition, type ReviewAction, type ReviewState } from '@shared/review';
import { AuditEvent, Part, PartRevision, User, type AuditAction } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { mailTemplates, type MailContent } from '../mail/templates';
import { notices } from '../notices/service';
import { canSeePart, isModerator } from '../parts/access';
import { presentPart, type PartDetail } from '../parts/presenter';
import type { EditRecord } from '../parts/service';
import { diffParts } from './diff';

export interface MailQueue {
  enqueue(to: string | string[], content: MailContent, transaction?: Transaction): Promise<void>;
}

export interface ReviewDeps {
  sequelize: Sequelize;
  mail: MailQueue;
  publicUrl: string;
  /** Called after a decision has been committed (e.g. to refresh the search index). */
  onDecided?: (partId: number, action: ReviewAction) => void;
  /** Called inside the approving transaction when a part goes on the shelf (wanted requests hear of it). */
  onPublished?: (part: Part, t: Transaction) => Promise<void>;
  /**
   * Called inside every decision's transaction once the part's state is written: recalls on kits and
   * the adaptation notice. `previousRevisionId` is the revision that was on the shelf before.
   */
  onDecision?: (
    part: Part,
    action: Exclude<ReviewAction, 'submit'>,
    info: { previousRevisionId: number | null; note: string | null },
    t: Transaction,
  ) => Promise<void>;
}

const AUDIT_ACTION: Record<ReviewAction, AuditAction> = {
  submit: 'submit',
  approve: 'approve',
  'send-back': 'send_back',
  reject: 'reject',
  retire: 'retire',
};

const MAIL_DECISION = { approve: 'approved', 'send-back': 'sent_back', reject: 'rejected', retire: 'retired' } as const;

const NOTICE_TITLE = {
  approve: 'On the shelf',
  'send-back': 'Sent back for changes',
  reject: 'Not accepted',
  retire: 'Retired from the shelf',
} as const;

/** Decisions a contributor sees about their own part (not moderation of other people's ratings). */
const CONTRIBUTOR_VISIBLE: AuditAction[] = ['submit', 'resubmit', 'edit', 'approve', 'send_back', 'reject', 'retire'];

const FIELD_LABELS: Record<string, string> = {
  title: 'Title',
  summary: 'Summary',
  description: 'Description',
  category: 'Category',
  licence: 'Licence',
  testedLoadKg: 'Tested load (kg)',
  'safety.carriesLoad': 'Carries load',
  'safety.overhead': 'Used overhead',
  'safety.vehicle': 'Used on a vehicle',
  'safety.heat': 'Exposed to heat or sun',
  mounts: 'Mount standards',
  keyDimensions: 'Key dimensions',
  recipes: 'Recipes',
  bodies: 'Camera bodies',
  status: 'Status',
};

/** The lines an edit event shows in the history: what changed, old → new where short enough. */
export function editLines(record: EditRecord): string[] {
  const lines = record.changes.map((c) =>
    c.before !== undefined ? `${FIELD_LABELS[c.field] ?? c.field}: “${c.before}” → “${c.after}”` : `${FIELD_LABELS[c.field] ?? c.field} changed`,
  );
  if (record.filesAdded?.length) lines.push(`Files added: ${record.filesAdded.join(', ')}`);
  if (record.filesRemoved?.length) lines.push(`Files removed: ${record.filesRemoved.join(', ')}`);
  return lines;
}

async function moderatorIds(except: number, transaction?: Transaction): Promise<{ ids: number[]; emails: string[] }> {
  const mods = await User.findAll({
    where: { role: { [Op.in]: ['moderator', 'admin'] }, status: 'active', id: { [Op.ne]: except } },
    transaction,
  });
  return { ids: mods.map((m) => m.id), emails: mods.map((m) => m.email) };
}

/** What a moderator should look at first: analysis problems, odd recipes, licence trouble. */
export async function reviewWarnings(detail: PartDetail): Promise<string[]> {
  const warnings: string[] = [];
  for (const file of detail.files) {
    if (file.kind !== 'model' || !file.analysis) continue;
    for (const concern of meshConcerns(file.analysis)) warnings.push(`${file.name}: ${concern}`);
  }
  for (const [i, recipe] of detail.recipes.entries()) {
    for (const w of recipe.warnings) warnings.push(`Recipe ${i + 1} (${recipe.material}): ${w}`);
  }
  if (!detail.recipes.some((r) => r.purpose === 'set-ready')) warnings.push('No set-ready recipe');
  if (!detail.files.some((f) => f.kind === 'photo')) warnings.push('No photo of a real print');
  const parentLicence = detail.lineage.parent?.licence?.id;
  if (parentLicence && isLicenceId(parentLicence) && isLicenceId(detail.licence.id)) {
    const check = checkAdaptationLicence(parentLicence, detail.licence.id);
    if (!check.ok) warnings.push(`Licence conflict with the parent: ${check.reason}`);
  }
  return warnings;
}

export function createReviewService({ sequelize, mail, publicUrl, onDecided, onPublished, onDecision }: ReviewDeps) {
  const partLink = (part: Part) => `${publicUrl}/parts/${part.slug}`;
  const deskLink = (part: Part) => `${publicUrl}/review/${part.id}`;

  async function record(
    actor: User,
    part: Part,
    revision: PartRevision | null,
    action: AuditAction,
    note: string | null,
    details: Record<string, unknown>,
    t: Transaction,
  ) {
    await AuditEvent.create({ partId: part.id, revisionId: revision?.id ?? null, actorId: actor.id, action, note, details }, { transaction: t });
  }

  function fourEyes(actor: User, part: Part, revision: PartRevision | null) {
    if (part.authorId === actor.id || revision?.createdBy === actor.id) {
      throw AppError.forbidden('You cannot decide on your own submission. Another moderator has to review it.');
    }
  }

  /** Whoever changed a revision that is not theirs cannot also approve it: a second moderator has to. */
  async function notEditedBy(actor: User, revision: PartRevision, t: Transaction) {
    const edits = await AuditEvent.count({ where: { revisionId: revision.id, actorId: actor.id, action: 'edit' }, transaction: t });
    if (edits) {
      throw AppError.forbidden('You changed this revision yourself, so another moderator has to approve it. You can still send it back or reject it.');
    }
  }

  /** The message for a decision that is no longer possible, naming who got there first. */
  async function alreadyDecided(part: Part, revision: PartRevision | null, message: string, t: Transaction): Promise<AppError> {
    const last = await AuditEvent.findOne({
      where: { partId: part.id, ...(revision ? { revisionId: revision.id } : {}), action: { [Op.in]: ['approve', 'send_back', 'reject', 'retire'] } },
      include: [{ model: User, as: 'actor' }],
      order: [['id', 'DESC']],
      transaction: t,
    });
    const who = last ? ` ${last.actor?.displayName ?? 'Another moderator'} decided at ${last.createdAt.toISOString().slice(0, 16).replace('T', ' ')} UTC.` : '';
    return AppError.conflict(`${message}${who}`);
  }

  return {
    /** Records a (re)submission and tells the moderators; runs inside the submitting transaction. */
    async submitted(actor: User, part: Part, revision: PartRevision, kind: 'submit' | 'resubmit', t: Transaction) {
      await record(actor, part, revision, kind, null, { revision: revision.number }, t);
      const mods = await moderatorIds(actor.id, t);
      const isRevision = revision.number > 1;
      await notices.notify(
        mods.ids,
        {
          kind: 'review',
          title: `${isRevision ? 'Changes to review' : 'New submission'}: ${revision.title}`,
          body: `From ${actor.displayName}.`,
          link: `/review/${part.id}`,
        },
        t,
      );
      if (mods.emails.length) {
        await mail.enqueue(
          mods.emails,
          mailTemplates.newSubmission({ partTitle: revision.title, contributor: actor.displayName, link: deskLink(part), isRevision }),
          t,
        );
      }
    },

    /** Puts an edit by someone other than the author on record and tells the author; inside the editing transaction. */
    async edited(actor: User, part: Part, revision: PartRevision, change: EditRecord, t: Transaction) {
      const lines = editLines(change);
      await record(actor, part, revision, 'edit', null, { revision: revision.number, lines, ...change }, t);
      await notices.notify(
        [part.authorId],
        {
          kind: 'review',
          title: `Changed by ${actor.displayName}: ${revision.title}`,
          body: lines.join('\n') || 'No visible change.',
          link: `/parts/${part.slug}`,
        },
        t,
      );
    },

    async queue() {
      const revisions = await PartRevision.findAll({
        where: { status: 'in_review' },
        include: [{ model: Part, as: 'part', required: true, include: [{ model: User, as: 'author' }] }],
        order: [
          ['submittedAt', 'ASC'],
          ['id', 'ASC'],
        ],
      });
      const now = Date.now();
      return Promise.all(
        revisions.map(async (rev) => {
          const part = (rev as PartRevision & { part: Part }).part;
          const detail = await presentPart(part, rev.id, undefined);
          const submittedAt = rev.submittedAt ?? rev.createdAt;
          return {
            partId: part.id,
            slug: part.slug,
            title: rev.title,
            revisionId: rev.id,
            revisionNumber: rev.number,
            isRevisionOfPublished: part.publishedRevisionId !== null,
            submittedAt: submittedAt.toISOString(),
            ageHours: Math.round(((now - submittedAt.getTime()) / 3_600_000) * 10) / 10,
            contributor: { id: part.authorId, displayName: part.author?.displayName ?? '' },
            category: detail.category,
            safety: { carriesLoad: rev.carriesLoad, overhead: rev.overhead, vehicle: rev.vehicle, heat: rev.heat },
            // a photo first; the model's drawn picture when there is none
            thumbnailUrl: (detail.files.find((f) => f.kind === 'photo' && f.thumbnailUrl) ?? detail.files.find((f) => f.thumbnailUrl))?.thumbnailUrl ?? null,
            warnings: await reviewWarnings(detail),
          };
        }),
      );
    },

    async detail(actor: User, partId: number) {
      const part = await Part.findByPk(partId);
      if (!part) throw AppError.notFound('There is no part with that id.');
      const submission = await presentPart(part, part.latestRevisionId!, actor);
      const published =
        part.publishedRevisionId && part.publishedRevisionId !== part.latestRevisionId ? await presentPart(part, part.publishedRevisionId, actor) : null;
      const state: ReviewState = part.status === 'retired' ? 'retired' : submission.revision.status;
      const latest = await PartRevision.findByPk(part.latestRevisionId!);
      const own = part.authorId === actor.id || latest?.createdBy === actor.id;
      const editedByYou = latest ? (await AuditEvent.count({ where: { revisionId: latest.id, actorId: actor.id, action: 'edit' } })) > 0 : false;
      return {
        submission,
        published,
        changes: published ? diffParts(published, submission) : [],
        warnings: await reviewWarnings(submission),
        checklist: REVIEW_CHECKLIST,
        allowedActions: own ? [] : allowedActions(state).filter((a) => !(editedByYou && a === 'approve')),
        ownSubmission: own,
        editedByYou,
        history: await this.history(actor, partId),
      };
    },

    async decide(actor: User, partId: number, action: Exclude<ReviewAction, 'submit'>, input: { note?: string; checklist?: string[] }) {
      const note = input.note?.trim() || null;
      if (NOTE_REQUIRED.has(action) && !note) throw AppError.badRequest('Write a note for the contributor.');
      const result = await transact(sequelize, async (t) => {
        // the row lock makes concurrent decisions on one part take turns; the loser sees the new state
        const part = await Part.findByPk(partId, { transaction: t, lock: t.LOCK.UPDATE });
        if (!part) throw AppError.notFound('There is no part with that id.');
        const revision = action === 'retire' ? null : await PartRevision.findByPk(part.latestRevisionId!, { transaction: t, lock: t.LOCK.UPDATE });
        fourEyes(actor, part, revision);
        if (action === 'approve' && revision) await notEditedBy(actor, revision, t);

        const previousRevisionId = part.publishedRevisionId;
        const from: ReviewState =
          action === 'retire' ? (part.status === 'retired' ? 'retired' : part.publishedRevisionId ? 'published' : part.status) : revision!.status;
        const step = transition(from, action);
        if (!step.ok) throw await alreadyDecided(part, revision, step.message, t);

        if (action === 'approve') {
          if (part.publishedRevisionId) await PartRevision.update({ status: 'superseded' }, { where: { id: part.publishedRevisionId }, transaction: t });
          await revision!.update({ status: 'published' }, { transaction: t });
          await part.update({ status: 'published', publishedRevisionId: revision!.id, publishedAt: part.publishedAt ?? new Date() }, { transaction: t });
          await onPublished?.(part, t);
        } else if (action === 'send-back' || action === 'reject') {
          const to = step.to as 'sent_back' | 'rejected';
          await revision!.update({ status: to }, { transaction: t });
          if (!part.publishedRevisionId) await part.update({ status: to }, { transaction: t });
        } else {
          await part.update({ status: 'retired' }, { transaction: t });
        }
        await part.update({ lockVersion: part.lockVersion + 1 }, { transaction: t });
        await onDecision?.(part, action, { previousRevisionId, note }, t);

        const shown = revision ?? (await PartRevision.findByPk(part.publishedRevisionId!, { transaction: t }))!;
        await record(
          actor,
          part,
          revision ?? shown,
          AUDIT_ACTION[action],
          note,
          { from, to: step.to, revision: shown.number, checklist: input.checklist ?? [] },
          t,
        );

        const author = (await User.findByPk(part.authorId, { transaction: t }))!;
        await notices.notify(
          [author.id],
          { kind: 'decision', title: `${NOTICE_TITLE[action]}: ${shown.title}`, body: note ?? 'No note from the moderator.', link: `/parts/${part.slug}` },
          t,
        );
        await mail.enqueue(
          author.email,
          mailTemplates.decision({ partTitle: shown.title, decision: MAIL_DECISION[action], note, moderator: actor.displayName, link: partLink(part) }),
          t,
        );
        return { id: part.id, slug: part.slug, status: part.status, revision: { number: shown.number, status: shown.status } };
      });
      onDecided?.(partId, action);
      return result;
    },

    async history(viewer: User, partId: number) {
      const part = await Part.findByPk(partId);
      if (!part || !(await canSeePart(viewer, part))) throw AppError.notFound('There is no part with that id on the shelf.');
      if (!isModerator(viewer) && part.authorId !== viewer.id) {
        throw AppError.forbidden('Only the contributor and moderators can see the review history of a part.');
      }
      const events = await AuditEvent.findAll({
        where: { partId, ...(isModerator(viewer) ? {} : { action: { [Op.in]: CONTRIBUTOR_VISIBLE } }) },
        include: [{ model: User, as: 'actor' }],
        order: [
          ['createdAt', 'ASC'],
          ['id', 'ASC'],
        ],
      });
      return events.map((e) => ({
        id: e.id,
        action: e.action,
        note: e.note,
        revision: (e.details?.revision as number | undefined) ?? null,
        actor: { id: e.actorId, displayName: e.actor?.displayName ?? '' },
        at: e.createdAt.toISOString(),
        details: isModerator(viewer) ? e.details : null,
        changes: e.action === 'edit' ? ((e.details?.lines as string[] | undefined) ?? []) : null,
      }));
    },
  };
}

export type ReviewService = ReturnType<typeof createReviewService>;
