// Over 350 lines: ratings, set reports and their moderation share the on-shelf check and the
// change hooks that refresh rankings; the next split would take flag / hide / flagged into moderation.ts.
// After the shoot: ratings and set reports, the evidence that makes a part proven, and moderation
// of abusive entries (hidden entries stay on record but leave every score).
import { Op, UniqueConstraintError, type Sequelize } from 'sequelize';
import { summariseEvidence, type Evidence, type SetCondition } from '@shared/evidence';
import type { RatingInput, SetReportInput } from '@shared/schemas/evidence';
import { AuditEvent, ContentFlag, Part, PartRevision, Rating, Recipe, ReportPhoto, SetReport, User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import type { InspectedFile } from '../files/inspect';
import type { PhotoJobs } from '../files/photo-jobs';
import type { FileStorage } from '../files/storage';
import { keysOf, photoColumns, stageUploads } from '../files/stored-files';
import { audienceOf, crewWhere, findVisiblePart, isModerator } from '../parts/access';
import type { Alerts } from '../notices/alerts';
import { reportWarningTexts, type RecallService } from '../recalls/service';
import { answerOfFirst, rememberKey, replayOf } from './client-keys';

export interface EvidenceDeps {
  sequelize: Sequelize;
  storage: FileStorage;
  photos: PhotoJobs;
  /** Called after evidence changed (ratings, reports, hiding), e.g. to refresh the search ranking. */
  onChanged?: (partId: number) => void;
  /** Tells a part's author about a set report saying it deformed, cracked or failed. */
  alerts?: Alerts;
  /** Puts a recall banner on kits holding a part when set reports raise a new warning. */
  recalls?: RecallService;
}

const TROUBLE: Record<string, string> = { deformed: 'deformed', cracked: 'cracked', failed: 'failed' };

type Target = 'rating' | 'report';

const visible = { hiddenAt: { [Op.is]: null } };

async function partOnShelf(viewer: User | undefined, id: string | number): Promise<Part> {
  const part = await findVisiblePart(viewer, id);
  if (part.status !== 'published') {
    throw AppError.conflict('Only parts that are on the shelf can be rated or reported on.');
  }
  return part;
}

function presentReport(r: SetReport, partId: number) {
  return {
    id: r.id,
    production: r.production,
    daysInUse: r.daysInUse,
    conditions: r.conditions,
    recipeId: r.recipeId,
    material: r.material,
    infillPct: r.infillPct,
    walls: r.walls,
    outcome: r.outcome,
    notes: r.notes,
    author: { id: r.userId, displayName: r.user?.displayName ?? '' },
    createdAt: r.createdAt.toISOString(),
    photos: (r.photos ?? []).map((p) => ({
      id: p.id,
      processing: p.processing,
      thumbnailUrl: p.processing === 'ready' ? `/api/parts/${partId}/reports/${r.id}/photos/${p.id}/thumb` : null,
      displayUrl: p.processing === 'ready' ? `/api/parts/${partId}/reports/${r.id}/photos/${p.id}/display` : null,
    })),
  };
}

export function createEvidenceService({ sequelize, storage, photos, onChanged, alerts, recalls }: EvidenceDeps) {
  async function catalogueMean(): Promise<number | null> {
    const row = (await Rating.findOne({ where: visible, attributes: [[sequelize.fn('AVG', sequelize.col('stars')), 'mean']], raw: true })) as unknown as {
      mean: string | null;
    } | null;
    return row?.mean == null ? null : Number(row.mean);
  }

  async function evidenceFor(partIds: number[]): Promise<Map<number, Evidence>> {
    const [reports, ratings, prior, parts] = await Promise.all([
      SetReport.findAll({
        where: { partId: { [Op.in]: partIds }, ...visible },
        attributes: ['partId', 'userId', 'production', 'createdAt', 'outcome', 'material', 'conditions'],
        order: [['id', 'ASC']],
      }),
      Rating.findAll({ where: { partId: { [Op.in]: partIds }, ...visible }, attributes: ['partId', 'stars'] }),
      catalogueMean(),
      Part.findAll({ where: { id: { [Op.in]: partIds } }, attributes: ['id', 'authorId'] }),
    ]);
    const authorOf = new Map(parts.map((p) => [p.id, p.authorId]));
    return new Map(
      partIds.map((id) => [
        id,
        summariseEvidence(
          reports.filter((r) => r.partId === id),
          ratings.filter((r) => r.partId === id).map((r) => r.stars),
          prior,
          // an author's own reports never raise their part's proven figure
          { authorId: authorOf.get(id) ?? null },
        ),
      ]),
    );
  }

  return {
    async rate(actor: User, partId: string, input: RatingInput, clientKey?: string) {
      const part = await partOnShelf(actor, partId);
      if (part.authorId === actor.id) throw AppError.forbidden('You cannot rate your own part; file a set report instead.');
      type Rated = { created: boolean; rating: { id: number; stars: number; comment: string | null } };
      const scope = `rating:${part.id}`;
      if (clientKey) {
        const seen = await replayOf<Rated>(actor.id, clientKey, scope);
        if (seen) return { ...seen, created: false, replayed: true };
      }
      const mine = { partId: part.id, userId: actor.id };
      const values = { stars: input.stars, comment: input.comment ?? null };
      let existing = await Rating.findOne({ where: mine });
      let rating: Rating;
      if (existing) {
        rating = await existing.update(values);
      } else {
        try {
          rating = await Rating.create({ ...mine, ...values, hiddenAt: null, hiddenBy: null, hiddenReason: null });
        } catch (err) {
          // the same member's other request created the row a moment ago: the later rating replaces it
          existing = err instanceof UniqueConstraintError ? await Rating.findOne({ where: mine }) : null;
          if (!existing) throw err;
          rating = await existing.update(values);
        }
      }
      onChanged?.(part.id);
      const result: Rated = { created: !existing, rating: { id: rating.id, stars: rating.stars, comment: rating.comment } };
      if (clientKey) {
        // a repeat that raced this one stored its answer first; both set the same stars
        await rememberKey(actor.id, clientKey, scope, result).catch((err) => {
          if (!(err instanceof UniqueConstraintError)) throw err;
        });
      }
      return { ...result, replayed: false };
    },

    async ratings(viewer: User | undefined, partId: string) {
      const part = await findVisiblePart(viewer, partId);
      const rows = await Rating.findAll({ where: { partId: part.id, ...visible }, include: [{ model: User, as: 'user' }], order: [['updatedAt', 'DESC']] });
      const evidence = (await evidenceFor([part.id])).get(part.id)!;
      const mine = viewer ? rows.find((r) => r.userId === viewer.id) : undefined;
      return {
        items: rows.map((r) => ({
          id: r.id,
          stars: r.stars,
          comment: r.comment,
          author: { id: r.userId, displayName: r.user?.displayName ?? '' },
          updatedAt: r.updatedAt.toISOString(),
        })),
        summary: evidence.rating,
        mine: mine ? { id: mine.id, stars: mine.stars, comment: mine.comment } : null,
      };
    },

    async fileReport(actor: User, partId: string, input: SetReportInput, files: InspectedFile[], clientKey?: string) {
      const part = await partOnShelf(actor, partId);
      if (files.some((f) => f.field !== 'photo')) throw AppError.field('photo', 'Attach photos (JPEG, PNG or WebP) only.', 'A set report takes photos only.');
      let material = input.material;
      if (input.recipeId) {
        const recipe = await Recipe.findByPk(input.recipeId);
        const revision = recipe ? await PartRevision.findByPk(recipe.revisionId) : null;
        if (!recipe || revision?.partId !== part.id) {
          throw AppError.field('recipeId', 'That recipe does not belong to this part.', 'Some fields need another look.');
        }
        material ??= recipe.material;
      }
      const scope = `report:${part.id}`;
      let filed: { id: number; rows: ReportPhoto[]; replayed: boolean };
      const staged = await stageUploads(
        storage,
        files.map((f) => ({ path: f.path, kind: 'photo' as const, extension: '' })),
      );
      try {
        filed = await staged.settle(
          transact(sequelize, async (t) => {
            if (clientKey) {
              const seen = await replayOf<{ id: number }>(actor.id, clientKey, scope, t);
              if (seen) return { id: seen.id, rows: [] as ReportPhoto[], replayed: true };
            }
            const warningsBefore = recalls ? await reportWarningTexts(part.id, t) : [];
            const report = await SetReport.create(
              {
                partId: part.id,
                userId: actor.id,
                production: input.production,
                daysInUse: input.daysInUse,
                conditions: input.conditions as SetCondition[],
                recipeId: input.recipeId ?? null,
                material: material!,
                infillPct: input.infillPct ?? null,
                walls: input.walls ?? null,
                outcome: input.outcome,
                notes: input.notes ?? null,
                hiddenAt: null,
                hiddenBy: null,
                hiddenReason: null,
              },
              { transaction: t },
            );
            const rows: ReportPhoto[] = [];
            for (const columns of photoColumns(files, staged.names))
              rows.push(await ReportPhoto.create({ reportId: report.id, ...columns }, { transaction: t }));
            if (clientKey) await rememberKey(actor.id, clientKey, scope, { id: report.id }, t);
            if (recalls) await recalls.reportsChanged(part, warningsBefore, await reportWarningTexts(part.id, t), t);
            if (alerts && TROUBLE[input.outcome] && part.authorId !== actor.id) {
              const title = (await PartRevision.findByPk(part.publishedRevisionId!, { attributes: ['title'], transaction: t }))?.title ?? part.slug;
              const where = input.production ? ` on ${input.production}` : '';
              await alerts.send(
                [part.authorId],
                'report_trouble',
                {
                  title: `Set report: “${title}” ${TROUBLE[input.outcome]}`,
                  body: `${actor.displayName} reports that “${title}” ${TROUBLE[input.outcome]}${where} after ${input.daysInUse} ${input.daysInUse === 1 ? 'day' : 'days'} in use (${material}).`,
                  link: `/parts/${part.slug}#reports`,
                  mail: {
                    subject: `A set report on your part: ${title} ${TROUBLE[input.outcome]}`,
                    heading: 'A set report needs your attention',
                    actionLabel: 'Read the report',
                    note: input.notes ? { label: `Notes from ${actor.displayName}`, text: input.notes } : null,
                  },
                },
                t,
                actor.id,
              );
            }
            return { id: report.id, rows, replayed: false };
          }),
          (f) => f.replayed,
        );
      } catch (err) {
        const seen = await answerOfFirst<{ id: number }>(err, actor.id, clientKey, scope);
        filed = { id: seen.id, rows: [], replayed: true };
      }
      for (const row of filed.rows) photos.clean(row, () => ReportPhoto.findByPk(row.id));
      if (!filed.replayed) onChanged?.(part.id);
      return { id: filed.id, replayed: filed.replayed };
    },

    async reports(viewer: User | undefined, partId: string, filter: { material?: string; condition?: string; outcome?: string }) {
      const part = await findVisiblePart(viewer, partId);
      const rows = await SetReport.findAll({
        where: { partId: part.id, ...visible, ...(filter.material && { material: filter.material }), ...(filter.outcome && { outcome: filter.outcome }) },
        include: [
          { model: User, as: 'user' },
          { model: ReportPhoto, as: 'photos' },
        ],
        order: [
          ['createdAt', 'DESC'],
          ['id', 'DESC'],
        ],
      });
      const items = rows.filter((r) => !filter.condition || r.conditions.includes(filter.condition as SetCondition));
      return { items: items.map((r) => presentReport(r, part.id)) };
    },

    async reportPhotoKey(viewer: User | undefined, partId: string, reportId: number, photoId: number, size: 'thumb' | 'display') {
      const part = await findVisiblePart(viewer, partId);
      const report = await SetReport.findOne({ where: { id: reportId, partId: part.id, ...visible } });
      const photo = report ? await ReportPhoto.findOne({ where: { id: photoId, reportId: report.id, processing: 'ready' } }) : null;
      if (!photo) throw AppError.notFound('There is no such photo.');
      const keys = keysOf({ kind: 'photo', storedName: photo.storedName });
      return size === 'thumb' ? keys.thumbnail! : keys.display!;
    },

    async proven(viewer: User | undefined, partId: string) {
      const part = await findVisiblePart(viewer, partId);
      return (await evidenceFor([part.id])).get(part.id)!;
    },

    evidenceFor,

    /** The figures search ranks by: proven score, report count and the (adjusted) rating. */
    async rankFigures(partIds: number[]) {
      const evidence = partIds.length ? await evidenceFor(partIds) : new Map<number, Evidence>();
      return new Map(
        [...evidence].map(([id, e]) => [
          id,
          { proven: e.proven, reports: e.reports, heldUp: e.heldUp, mean: e.rating.mean, count: e.rating.count, adjusted: e.rating.adjusted },
        ]),
      );
    },

    async flag(actor: User, type: Target, id: number, reason: string) {
      const target = type === 'rating' ? await Rating.findByPk(id) : await SetReport.findByPk(id);
      if (!target || target.hiddenAt) throw AppError.notFound(`There is no such ${type}.`);
      await findVisiblePart(actor, target.partId);
      if (target.userId === actor.id) throw AppError.conflict(`That is your own ${type}; edit or ask a moderator instead.`);
      const [, created] = await ContentFlag.findOrCreate({
        where: { targetType: type, targetId: id, userId: actor.id },
        defaults: { targetType: type, targetId: id, userId: actor.id, reason, resolvedAt: null },
      });
      return { flagged: true, alreadyFlagged: !created };
    },

    async hide(actor: User, type: Target, id: number, note: string) {
      const result = await transact(sequelize, async (t) => {
        const Target = (type === 'rating' ? Rating : SetReport) as typeof Rating;
        const target = await Target.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
        if (!target) throw AppError.notFound(`There is no such ${type}.`);
        const part = await Part.findByPk(target.partId, { transaction: t });
        if (part?.authorId === actor.id) {
          throw AppError.forbidden(`This ${type} is about your own part, so another moderator has to decide on it.`);
        }
        if (target.hiddenAt) throw AppError.conflict(`This ${type} is already hidden.`);
        await target.update({ hiddenAt: new Date(), hiddenBy: actor.id, hiddenReason: note }, { transaction: t });
        await ContentFlag.update({ resolvedAt: new Date() }, { where: { targetType: type, targetId: id }, transaction: t });
        await AuditEvent.create(
          {
            partId: target.partId,
            revisionId: null,
            actorId: actor.id,
            action: type === 'rating' ? 'hide_rating' : 'hide_report',
            note,
            details: { [`${type}Id`]: id, author: target.userId },
          },
          { transaction: t },
        );
        return { id, hidden: true, partId: target.partId };
      });
      onChanged?.(result.partId);
      return { id: result.id, hidden: true };
    },

    /** Flagged entries waiting for a moderator, oldest flag first; never those about the moderator's own parts. */
    async flagged(viewer: User) {
      const own = new Set((await Part.findAll({ where: { authorId: viewer.id }, attributes: ['id'] })).map((p) => p.id));
      const flags = await ContentFlag.findAll({ where: { resolvedAt: { [Op.is]: null } }, order: [['createdAt', 'ASC']] });
      const byTarget = new Map<string, ContentFlag[]>();
      for (const f of flags) byTarget.set(`${f.targetType}:${f.targetId}`, [...(byTarget.get(`${f.targetType}:${f.targetId}`) ?? []), f]);
      const items = [];
      for (const [key, list] of byTarget) {
        const [type, id] = key.split(':') as [Target, string];
        const target = type === 'rating' ? await Rating.findByPk(Number(id)) : await SetReport.findByPk(Number(id));
        if (!target || own.has(target.partId)) continue;
        items.push({
          type,
          id: Number(id),
          partId: target.partId,
          text: type === 'rating' ? (target as Rating).comment : (target as SetReport).notes,
          flags: list.map((f) => ({ reason: f.reason, at: f.createdAt.toISOString() })),
        });
      }
      return items;
    },

    async profile(viewer: User | undefined, userId: number) {
      const user = await User.findByPk(userId);
      if (!user || (user.status !== 'active' && !isModerator(viewer))) throw AppError.notFound('There is no such crew member.');
      const parts = await Part.findAll({
        where: { [Op.and]: [{ authorId: userId, status: 'published' }, crewWhere(await audienceOf(viewer))] },
        include: [{ model: PartRevision, as: 'publishedRevision' }],
        order: [['publishedAt', 'DESC']],
      });
      const evidence = await evidenceFor(parts.map((p) => p.id));
      return {
        user: { id: user.id, displayName: user.displayName, crewRole: user.crewRole, memberSince: user.createdAt.toISOString() },
        parts: parts.map((p) => {
          const e = evidence.get(p.id)!;
          return {
            id: p.id,
            slug: p.slug,
            title: p.publishedRevision?.title ?? p.slug,
            proven: e.proven,
            reports: e.reports,
            heldUp: e.heldUp,
            rating: { mean: e.rating.mean, count: e.rating.count },
            warnings: e.warnings.map((w) => w.text),
          };
        }),
      };
    },
  };
}

export type EvidenceService = ReturnType<typeof createEvidenceService>;
