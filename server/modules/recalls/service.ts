// Recall banners on shoot kits. When a part is retired, when a newly approved revision changes its
// cautions, or when set reports raise a new warning about it, every kit holding the part gets a
// banner naming the part and the reason. Raised inside the transaction of that event; it stays until
// the kit's owner acknowledges it. Members the kit is shared with see it too.
import { Op, type Transaction } from 'sequelize';
import { evidenceWarnings, onePerMemberAndProduction, type ReportFacts } from '@shared/evidence';
import { safetyCautions } from '@shared/safety';
import type { KitRecallInfo } from '@shared/schemas/notices';
import { KitItem, KitRecall, Part, PartRevision, Recipe, SetReport, type User } from '../../db/models';
import type { KitRecallKind } from '../../db/models/kit-recall';
import { AppError } from '../../errors';
import { findKit } from '../planning/access';

async function titleOf(part: Part, t?: Transaction): Promise<string> {
  const rev = await PartRevision.findByPk(part.publishedRevisionId ?? part.latestRevisionId!, { attributes: ['title'], transaction: t });
  return rev?.title ?? part.slug;
}

async function cautionTexts(revisionId: number, t: Transaction): Promise<string[]> {
  const rev = await PartRevision.findByPk(revisionId, { transaction: t });
  if (!rev) return [];
  const recipes = await Recipe.findAll({ where: { revisionId }, attributes: ['material'], transaction: t });
  const flags = { carriesLoad: rev.carriesLoad, overhead: rev.overhead, vehicle: rev.vehicle, heat: rev.heat };
  return safetyCautions(
    flags,
    rev.testedLoadKg,
    recipes.map((r) => r.material),
  ).map((c) => c.text);
}

/** The warnings set reports raise about a part, as the part page shows them (every member's, one per production). */
export async function reportWarningTexts(partId: number, t: Transaction, extra: ReportFacts[] = []): Promise<string[]> {
  const rows = await SetReport.findAll({
    where: { partId, hiddenAt: { [Op.is]: null } },
    attributes: ['userId', 'production', 'createdAt', 'outcome', 'material', 'conditions'],
    order: [['id', 'ASC']],
    transaction: t,
  });
  const facts: ReportFacts[] = [
    ...rows.map((r) => ({
      userId: r.userId,
      production: r.production,
      createdAt: r.createdAt,
      outcome: r.outcome,
      material: r.material,
      conditions: r.conditions,
    })),
    ...extra,
  ];
  return evidenceWarnings(onePerMemberAndProduction(facts)).map((w) => w.text);
}

export function createRecallService() {
  async function raise(part: Part, kind: KitRecallKind, reason: string, t: Transaction): Promise<number> {
    const items = await KitItem.findAll({ where: { partId: part.id }, attributes: ['kitId'], transaction: t });
    const kitIds = [...new Set(items.map((i) => i.kitId))];
    if (!kitIds.length) return 0;
    const partTitle = (await titleOf(part, t)).slice(0, 200);
    await KitRecall.bulkCreate(
      kitIds.map((kitId) => ({ kitId, partId: part.id, kind, partTitle, reason, acknowledgedAt: null, acknowledgedBy: null })),
      { transaction: t },
    );
    return kitIds.length;
  }

  return {
    raise,

    /** Inside a review decision: retiring recalls; an approval that changes the cautions does too. */
    async reviewDecision(part: Part, action: string, info: { previousRevisionId: number | null; note: string | null }, t: Transaction) {
      if (action === 'retire') {
        await raise(part, 'retired', info.note ? `Retired from the shelf: ${info.note}` : 'Retired from the shelf by the review desk.', t);
        return;
      }
      if (action !== 'approve' || !info.previousRevisionId || !part.publishedRevisionId || info.previousRevisionId === part.publishedRevisionId) return;
      const [before, after] = await Promise.all([cautionTexts(info.previousRevisionId, t), cautionTexts(part.publishedRevisionId, t)]);
      const added = after.filter((c) => !before.includes(c));
      const dropped = before.filter((c) => !after.includes(c));
      if (!added.length && !dropped.length) return;
      const lines = [...added.map((c) => `New caution: ${c}`), ...dropped.map((c) => `No longer stated: ${c}`)];
      await raise(part, 'cautions', `A new revision changed its cautions. ${lines.join(' ')}`, t);
    },

    /** Inside the filing of a set report: a warning the part did not have before recalls it. */
    async reportsChanged(part: Part, before: string[], after: string[], t: Transaction) {
      const added = after.filter((w) => !before.includes(w));
      if (added.length) await raise(part, 'reports', `Set reports now warn: ${added.join('; ')}.`, t);
    },

    async forKit(viewer: User, kitId: number): Promise<KitRecallInfo[]> {
      const { kit } = await findKit(viewer, kitId, 'read');
      const rows = await KitRecall.findAll({ where: { kitId: kit.id, acknowledgedAt: { [Op.is]: null } }, order: [['id', 'ASC']] });
      const parts = await Part.findAll({ where: { id: { [Op.in]: [...new Set(rows.map((r) => r.partId))] } }, attributes: ['id', 'slug'] });
      const slug = new Map(parts.map((p) => [p.id, p.slug]));
      return rows.map((r) => ({
        id: r.id,
        partId: r.partId,
        partTitle: r.partTitle,
        partLink: `/parts/${slug.get(r.partId) ?? r.partId}`,
        kind: r.kind,
        reason: r.reason,
        createdAt: r.createdAt.toISOString(),
      }));
    },

    async acknowledge(viewer: User, kitId: number, recallId: number): Promise<void> {
      const { kit } = await findKit(viewer, kitId, 'owner', 'Only the kit’s owner can acknowledge a recall; it stays on the kit until they do.');
      const [count] = await KitRecall.update(
        { acknowledgedAt: new Date(), acknowledgedBy: viewer.id },
        { where: { id: recallId, kitId: kit.id, acknowledgedAt: { [Op.is]: null } } },
      );
      if (!count && !(await KitRecall.count({ where: { id: recallId, kitId: kit.id } }))) throw AppError.notFound('There is no such recall on this kit.');
    },
  };
}

export type RecallService = ReturnType<typeof createRecallService>;
