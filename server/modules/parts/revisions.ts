// Writing revisions: a published revision is never edited in place. Changes to a published part go
// into a new revision (in review) and the published one stays on the shelf until that is approved.
import { Op, type Transaction } from 'sequelize';
import type { PartSubmission, PartUpdate } from '@shared/schemas/part';
import type { PartStatus } from '@shared/types';
import { CameraBody, Part, PartRevision, Recipe, RevisionBody, RevisionFile, type User } from '../../db/models';
import { AppError } from '../../errors';
import { renderMarkdown } from './markdown';

type RevisionFields = Omit<PartUpdate, 'bodies' | 'recipes' | 'safety' | 'description'> & {
  description?: string;
  safety?: PartSubmission['safety'];
};

/** What part_revisions.description_html (MEDIUMTEXT, 16 MiB) is allowed to hold, with room to spare. */
export const MAX_DESCRIPTION_HTML_BYTES = 4 * 1024 * 1024;

/** The description's safe HTML; refused with a field message if it would not fit its column. */
export function renderDescription(source: string, maxBytes = MAX_DESCRIPTION_HTML_BYTES): string {
  const html = renderMarkdown(source);
  if (Buffer.byteLength(html, 'utf8') > maxBytes) {
    throw AppError.field('description', 'This description becomes too long once formatted. Shorten it, or use less markup.', 'Some fields need another look.');
  }
  return html;
}

export function revisionColumns(input: RevisionFields) {
  return {
    ...(input.title !== undefined && { title: input.title }),
    ...(input.summary !== undefined && { summary: input.summary }),
    ...(input.description !== undefined && { descriptionMd: input.description, descriptionHtml: renderDescription(input.description) }),
    ...(input.category !== undefined && { category: input.category }),
    ...(input.licence !== undefined && { licence: input.licence }),
    ...(input.mounts !== undefined && { mounts: input.mounts }),
    ...(input.keyDimensions !== undefined && { keyDimensions: input.keyDimensions }),
    ...(input.testedLoadKg !== undefined && { testedLoadKg: input.testedLoadKg ?? null }),
    ...(input.safety !== undefined && input.safety),
  };
}

/** Resolves camera-body slugs to ids, with a field message naming any that are unknown. */
export async function bodyIdsFor(slugs: string[], transaction?: Transaction): Promise<number[]> {
  const unique = [...new Set(slugs)];
  if (!unique.length) return [];
  const bodies = await CameraBody.findAll({ where: { slug: { [Op.in]: unique } }, transaction });
  const unknown = unique.filter((s) => !bodies.some((b) => b.slug === s));
  if (unknown.length) {
    throw AppError.field('bodies', `Unknown camera body: ${unknown.join(', ')}. Pick bodies from the list.`, 'Some fields need another look.');
  }
  return bodies.map((b) => b.id);
}

// A brand-new revision only inserts: deleting its (not yet existing) rows first would take gap locks
// at the end of the index, and two submissions doing that at once deadlock each other.
export async function insertBodies(revisionId: number, bodyIds: number[], transaction: Transaction) {
  if (!bodyIds.length) return;
  await RevisionBody.bulkCreate(
    bodyIds.map((bodyId) => ({ revisionId, bodyId })),
    { transaction },
  );
}

export async function replaceBodies(revisionId: number, bodyIds: number[], transaction: Transaction) {
  await RevisionBody.destroy({ where: { revisionId }, transaction });
  await insertBodies(revisionId, bodyIds, transaction);
}

export async function replaceRecipes(revisionId: number, recipes: PartSubmission['recipes'], transaction: Transaction) {
  await Recipe.destroy({ where: { revisionId }, transaction });
  await insertRecipes(revisionId, recipes, transaction);
}

export async function insertRecipes(revisionId: number, recipes: PartSubmission['recipes'], transaction: Transaction) {
  if (!recipes.length) return;
  await Recipe.bulkCreate(
    recipes.map((r, position) => ({
      ...r,
      revisionId,
      position,
      orientationNote: r.orientationNote ?? null,
      printerBedMm: r.printerBedMm ?? null,
      resultNotes: r.resultNotes ?? null,
    })),
    { transaction },
  );
}

async function cloneRevision(part: Part, from: PartRevision, actor: User, transaction: Transaction): Promise<PartRevision> {
  const max = (await PartRevision.max<number, PartRevision>('number', { where: { partId: part.id }, transaction })) ?? 0;
  const { id: _id, createdAt: _c, updatedAt: _u, ...fields } = from.get({ plain: true }) as PartRevision;
  const next = await PartRevision.create({ ...fields, number: max + 1, status: 'in_review', createdBy: actor.id, submittedAt: new Date() }, { transaction });
  const bodies = await RevisionBody.findAll({ where: { revisionId: from.id }, transaction });
  await RevisionBody.bulkCreate(
    bodies.map((b) => ({ revisionId: next.id, bodyId: b.get('bodyId') })),
    { transaction },
  );
  const recipes = await Recipe.findAll({ where: { revisionId: from.id }, order: [['position', 'ASC']], transaction });
  await Recipe.bulkCreate(
    recipes.map((r) => {
      const { id: _rid, ...rest } = r.get({ plain: true }) as Recipe;
      return { ...rest, revisionId: next.id };
    }),
    { transaction },
  );
  const files = await RevisionFile.findAll({ where: { revisionId: from.id }, transaction });
  await RevisionFile.bulkCreate(
    files.map((f) => ({ revisionId: next.id, fileId: f.fileId, position: f.position })),
    { transaction },
  );
  await part.update({ latestRevisionId: next.id }, { transaction });
  return next;
}

/**
 * The revision that changes go into: the latest one while it is still under the contributor's
 * control, or a new one copied from it when the latest is already published.
 */
export async function editableRevision(part: Part, actor: User, transaction: Transaction): Promise<{ revision: PartRevision; created: boolean }> {
  const latest = await PartRevision.findByPk(part.latestRevisionId!, { transaction, lock: transaction.LOCK.UPDATE });
  if (!latest) throw new Error(`part ${part.id} has no latest revision`);
  if (latest.status === 'published') return { revision: await cloneRevision(part, latest, actor, transaction), created: true };
  if (latest.status === 'rejected' && part.publishedRevisionId) {
    // a rejected change to a published part: start again from what is on the shelf
    const published = (await PartRevision.findByPk(part.publishedRevisionId, { transaction }))!;
    return { revision: await cloneRevision(part, published, actor, transaction), created: true };
  }
  if (latest.status === 'rejected' || latest.status === 'superseded') {
    throw AppError.conflict('This revision can no longer be changed.');
  }
  return { revision: latest, created: false };
}

/**
 * After an edit the revision goes (back) to the review desk; an unpublished part's status follows it.
 * Returns true when this edit resubmitted a revision that had been sent back (or was a draft).
 */
export async function markChanged(part: Part, revision: PartRevision, transaction: Transaction): Promise<boolean> {
  const resubmitted = revision.status === 'sent_back' || revision.status === 'draft';
  if (resubmitted) {
    // what comes back after a send-back is the contributor's next version: it gets the next number,
    // so the desk and the history tell the two apart (the history keeps the number each event saw)
    const number =
      revision.status === 'sent_back'
        ? ((await PartRevision.max<number, PartRevision>('number', { where: { partId: part.id }, transaction })) ?? revision.number) + 1
        : revision.number;
    await revision.update({ status: 'in_review', submittedAt: new Date(), number }, { transaction });
  }
  await part.update({ status: part.publishedRevisionId ? part.status : (revision.status as PartStatus), lockVersion: part.lockVersion + 1 }, { transaction });
  return resubmitted;
}

/** One line of an edit's record: which field, and the old and new value where it is short enough to show. */
export interface EditChange {
  field: string;
  before?: string;
  after?: string;
}

const SHOWN_FIELDS = ['title', 'summary', 'category', 'licence', 'testedLoadKg'] as const;
const SAFETY_FIELDS = ['carriesLoad', 'overhead', 'vehicle', 'heat'] as const;
const clip = (v: unknown) => {
  const text = v === null || v === undefined ? 'none' : String(v);
  return text.length > 300 ? `${text.slice(0, 299)}…` : text;
};

/** What a PATCH changes on a revision, from the revision as it was before it. */
export function editChanges(before: PartRevision, patch: PartUpdate): EditChange[] {
  const changes: EditChange[] = [];
  for (const field of SHOWN_FIELDS) {
    if (patch[field] === undefined) continue;
    const old = before[field];
    const next = patch[field] ?? null;
    if (String(old ?? 'none') !== String(next ?? 'none')) changes.push({ field, before: clip(old), after: clip(next) });
  }
  if (patch.description !== undefined && patch.description !== before.descriptionMd) {
    changes.push({ field: 'description', before: clip(before.descriptionMd), after: clip(patch.description) });
  }
  if (patch.safety) {
    for (const flag of SAFETY_FIELDS) {
      if (patch.safety[flag] !== undefined && patch.safety[flag] !== before[flag]) {
        changes.push({ field: `safety.${flag}`, before: before[flag] ? 'yes' : 'no', after: patch.safety[flag] ? 'yes' : 'no' });
      }
    }
  }
  for (const field of ['mounts', 'keyDimensions'] as const) {
    if (patch[field] !== undefined && JSON.stringify(patch[field]) !== JSON.stringify(before[field])) changes.push({ field });
  }
  // recipes and camera bodies are replaced whole: sending them counts as a change
  if (patch.recipes) changes.push({ field: 'recipes' });
  if (patch.bodies) changes.push({ field: 'bodies' });
  return changes;
}
