// Over 350 lines on purpose: create, update, resubmit and addFiles share the service's transaction
// and moved-file undo helpers; access, presenter, revisions and part-files are already files of their own.
// The catalogue's core record: submitting, reading, editing parts and their files.
import { Op, UniqueConstraintError, type CreationAttributes, type Sequelize, type Transaction } from 'sequelize';
import { slugify } from '@shared/catalogue';
import { transition } from '@shared/review';
import { checkAdaptationLicence, isLicenceId } from '@shared/licences';
import type { PartVisibility } from '@shared/schemas/crews';
import type { PartSubmission, PartUpdate } from '@shared/schemas/part';
import { CrewMember, Part, PartFile, PartRevision, ReportPhoto, RevisionFile, type User, type WantedPhoto } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { answerOfFirst, rememberKey, replayOf } from '../evidence/client-keys';
import type { InspectedFile } from '../files/inspect';
import type { PhotoJobs } from '../files/photo-jobs';
import type { RenderJobs } from '../files/render-jobs';
import type { FileStorage } from '../files/storage';
import { keysOf, stageUploads } from '../files/stored-files';
import { parseParams } from '../make/made';
import { assertCanEdit, audienceOf, crewAllows, crewWhere, findVisiblePart, seesUnpublished } from './access';
import { attachFiles, fileKind, removeStoredFiles, sweepUploads } from './part-files';
import { presentPart, presentSummaries } from './presenter';
import {
  bodyIdsFor,
  editableRevision,
  editChanges,
  insertBodies,
  insertRecipes,
  markChanged,
  replaceBodies,
  replaceRecipes,
  revisionColumns,
  type EditChange,
} from './revisions';

export type SubmissionHook = (actor: User, part: Part, revision: PartRevision, kind: 'submit' | 'resubmit', t: Transaction) => Promise<void>;
/** What someone other than the author changed on a revision (fields, files added, files removed). */
export interface EditRecord {
  changes: EditChange[];
  filesAdded?: string[];
  filesRemoved?: string[];
}
export type EditHook = (actor: User, part: Part, revision: PartRevision, record: EditRecord, t: Transaction) => Promise<void>;

export interface PartsDeps {
  sequelize: Sequelize;
  storage: FileStorage;
  /** The start-up sweep leaves stored files younger than this alone (STORAGE_SWEEP_MIN_AGE_S). */
  sweepMinAgeMs?: number;
  photos: PhotoJobs;
  /** Draws each model's preview picture; without it models keep their pictures waiting. */
  renders?: RenderJobs;
  /** Tells the review desk about a new or changed submission, inside the same transaction. */
  onSubmitted?: SubmissionHook;
  /** Puts an edit by someone other than the author on record, inside the same transaction. */
  onEdited?: EditHook;
  /** Wanted-request photos the start-up sweep found waiting to be cleaned. */
  onRecovered?: (wantedPhotos: WantedPhoto[]) => void;
  /** A published part changed who sees it (search reads it again). */
  onVisibilityChanged?: () => void;
}

/** A part made on the make pages records its maker and sizes; it carries no tested load (nobody tested these sizes). */
function madeWithColumns(input: PartSubmission): { makeKind: string | null; makeParams: Record<string, unknown> | null } {
  if (!input.make) return { makeKind: null, makeParams: null };
  if (input.testedLoadKg != null) {
    throw AppError.field('testedLoadKg', 'A part made to size has no tested load: leave the tested load empty. Set reports tell the crew how it holds up.');
  }
  try {
    return { makeKind: input.make.kind, makeParams: parseParams(input.make.kind, input.make.params) };
  } catch (err) {
    if (err instanceof AppError && err.fields) {
      const fields = Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [`make.${k}`, v]));
      throw AppError.fields(err.message, fields);
    }
    if (err instanceof AppError && err.status === 404) throw AppError.field('make.kind', err.message);
    throw err;
  }
}

async function uniqueSlug(title: string, transaction: Transaction, alsoTaken: Set<string>): Promise<string> {
  const base = slugify(title);
  const taken = await Part.findAll({ where: { slug: { [Op.like]: `${base}%` } }, attributes: ['slug'], transaction });
  const used = new Set([...taken.map((p) => p.slug), ...alsoTaken]);
  if (!used.has(base)) return base;
  for (let n = 2; ; n++) if (!used.has(`${base}-${n}`)) return `${base}-${n}`;
}

export function createPartsService({ sequelize, storage, sweepMinAgeMs, photos, renders, onSubmitted, onEdited, onRecovered, onVisibilityChanged }: PartsDeps) {
  /** Records what an edit did: a new revision of a published part, or a resubmission after changes. */
  async function afterEdit(actor: User, part: Part, edit: { revision: PartRevision; created: boolean }, t: Transaction, record?: EditRecord) {
    // the author's own edits are on record as (re)submissions; anyone else's edit is an event of its own
    if (actor.id !== part.authorId && record) await onEdited?.(actor, part, edit.revision, record, t);
    const resubmitted = await markChanged(part, edit.revision, t);
    if (edit.created) await onSubmitted?.(actor, part, edit.revision, 'submit', t);
    else if (resubmitted) await onSubmitted?.(actor, part, edit.revision, 'resubmit', t);
  }

  function queuePhotos(rows: PartFile[]) {
    for (const row of rows.filter((r) => r.kind === 'photo')) photos.clean(row, () => PartFile.findByPk(row.id));
    queueRenders(rows);
  }

  function queueRenders(rows: PartFile[]) {
    if (!renders) return;
    for (const row of rows.filter((r) => r.kind === 'model' && r.renderStatus === 'pending')) {
      renders.render(row, keysOf(row), () => PartFile.findByPk(row.id));
    }
  }

  async function checkParentLicence(parentId: number | null | undefined, licence: string, viewer: User) {
    if (!parentId) return;
    const parent = await Part.findByPk(parentId);
    if (!parent || !crewAllows(await audienceOf(viewer), parent) || (!parent.publishedRevisionId && !seesUnpublished(viewer, parent))) {
      throw AppError.field('parentId', 'The part you are adapting is not on the shelf.');
    }
    const parentRev = await PartRevision.findByPk(parent.publishedRevisionId ?? parent.latestRevisionId!);
    if (!parentRev || !isLicenceId(parentRev.licence) || !isLicenceId(licence)) return;
    const check = checkAdaptationLicence(parentRev.licence, licence);
    if (!check.ok) throw AppError.field('licence', check.reason);
  }

  /** The crew id a visibility choice stands for; only a crew the actor is in (moderators too). */
  async function crewIdFor(actor: User, visibility: PartVisibility | undefined, t?: Transaction): Promise<number | null> {
    if (!visibility || visibility === 'everyone') return null;
    const member = await CrewMember.findOne({ where: { crewId: visibility.crewId, userId: actor.id }, transaction: t });
    if (!member) throw AppError.field('visibility', 'You can publish a part only to a crew you are in. Choose one of your crews, or everyone.');
    return visibility.crewId;
  }

  function requireModel(files: InspectedFile[]) {
    if (!files.some((f) => f.field === 'model')) {
      throw AppError.field('model', 'Add at least one model file (STL or 3MF).');
    }
  }

  /**
   * Places the uploads first (stageUploads), then runs the write in one transaction (retried on
   * deadlock) with their stored names; the files are removed again if it files nothing, and photos
   * are queued once it has committed.
   */
  async function writeWithFiles<T>(
    files: InspectedFile[],
    work: (t: Transaction, names: string[]) => Promise<{ result: T; photos?: PartFile[]; filedNothing?: boolean }>,
  ) {
    const staged = await stageUploads(
      storage,
      files.map((f) => ({ path: f.path, kind: fileKind(f), extension: f.extension })),
    );
    const out = await staged.settle(
      transact(sequelize, (t) => work(t, staged.names)),
      (o) => o.filedNothing === true,
    );
    queuePhotos(out.photos ?? []);
    return out.result;
  }

  /** The part row under a free slug; a slug taken by a submission committed meanwhile is skipped. */
  async function createPart(title: string, fields: Omit<CreationAttributes<Part>, 'slug'>, t: Transaction): Promise<Part> {
    const tried = new Set<string>();
    for (let i = 0; i < 20; i++) {
      const slug = await uniqueSlug(title, t, tried);
      try {
        return await Part.create({ ...fields, slug }, { transaction: t });
      } catch (err) {
        if (!(err instanceof UniqueConstraintError)) throw err;
        tried.add(slug);
      }
    }
    throw AppError.conflict('Another part with this title was submitted at the same moment. Submit again.');
  }

  return {
    /** Clears what a crash left behind and resumes photos that were waiting to be cleaned. */
    async recover(options: { minAgeMs?: number } = {}) {
      const minAgeMs = Math.max(options.minAgeMs ?? 0, sweepMinAgeMs ?? 0);
      const { removed, pendingPhotos, pendingReportPhotos, pendingWantedPhotos, pendingRenders } = await sweepUploads(storage, {
        minAgeMs,
        tmpMinAgeMs: options.minAgeMs,
      });
      onRecovered?.(pendingWantedPhotos);
      queuePhotos(pendingPhotos);
      for (const row of pendingReportPhotos) photos.clean(row, () => ReportPhoto.findByPk(row.id));
      queueRenders(pendingRenders);
      return {
        removed,
        resumed: pendingPhotos.length + pendingReportPhotos.length + pendingWantedPhotos.length,
        pictures: renders ? pendingRenders.length : 0,
      };
    },

    /** Photos and models claimed from an instance that went away (jobs/runner.ts). */
    takeOver(rows: PartFile[]) {
      queuePhotos(rows);
    },

    /** Resolves when every model picture queued so far is drawn (or has failed). */
    rendersSettled(): Promise<void> {
      return renders?.settled() ?? Promise.resolve();
    },

    /** Resolves when every photo queued so far has been cleaned (tests and shutdown wait on it). */
    photosSettled(): Promise<void> {
      return photos.settled();
    },

    /** With an Idempotency-Key, the same submission sent again (its answer was lost) files nothing and answers the first. */
    async create(actor: User, input: PartSubmission, files: InspectedFile[], clientKey?: string) {
      requireModel(files);
      const made = madeWithColumns(input);
      const bodyIds = await bodyIdsFor(input.bodies);
      await checkParentLicence(input.parentId, input.licence, actor);
      const crewId = await crewIdFor(actor, input.visibility);
      type Created = { id: number; slug: string; status: string };

      return writeWithFiles(files, async (t, names) => {
        if (clientKey) {
          const seen = await replayOf<Created>(actor.id, clientKey, 'part', t);
          if (seen) return { result: seen, filedNothing: true };
        }
        const part = await createPart(
          input.title,
          {
            authorId: actor.id,
            parentId: input.parentId ?? null,
            crewId,
            status: 'in_review',
            publishedRevisionId: null,
            latestRevisionId: null,
            publishedAt: null,
          },
          t,
        );
        const revision = await PartRevision.create(
          {
            partId: part.id,
            number: 1,
            status: 'in_review',
            title: input.title,
            summary: input.summary,
            descriptionMd: '',
            descriptionHtml: '',
            category: input.category,
            licence: input.licence,
            mounts: [],
            keyDimensions: [],
            carriesLoad: false,
            overhead: false,
            vehicle: false,
            heat: false,
            testedLoadKg: null,
            createdBy: actor.id,
            submittedAt: new Date(),
            ...revisionColumns(input),
            ...made,
          },
          { transaction: t },
        );
        await insertBodies(revision.id, bodyIds, t);
        await insertRecipes(revision.id, input.recipes, t);
        await part.update({ latestRevisionId: revision.id }, { transaction: t });
        const rows = await attachFiles({ partId: part.id, revisionId: revision.id, createdBy: actor.id, files, names }, t);
        await onSubmitted?.(actor, part, revision, 'submit', t);
        const result: Created = { id: part.id, slug: part.slug, status: part.status };
        if (clientKey) await rememberKey(actor.id, clientKey, 'part', result, t);
        return { result, photos: rows };
      }).catch((err: unknown) => answerOfFirst<Created>(err, actor.id, clientKey, 'part'));
    },

    async get(viewer: User | undefined, idOrSlug: string) {
      const part = await findVisiblePart(viewer, idOrSlug);
      const revisionId = seesUnpublished(viewer, part) ? part.latestRevisionId! : part.publishedRevisionId!;
      return presentPart(part, revisionId, viewer);
    },

    async list(viewer: User | undefined, query: { mine?: boolean; status?: string }) {
      if (query.mine) {
        if (!viewer) throw AppError.unauthorized('Sign in to see your submissions.');
        const parts = await Part.findAll({ where: { authorId: viewer.id }, order: [['updatedAt', 'DESC']] });
        return presentSummaries(parts, (p) => p.latestRevisionId);
      }
      const parts = await Part.findAll({
        where: { [Op.and]: [{ status: 'published', publishedRevisionId: { [Op.ne]: null } }, crewWhere(await audienceOf(viewer))] },
        order: [['publishedAt', 'DESC']],
        limit: 200,
      });
      return presentSummaries(parts, (p) => p.publishedRevisionId);
    },

    async update(actor: User, id: string, patch: PartUpdate) {
      const bodyIds = patch.bodies ? await bodyIdsFor(patch.bodies) : null;
      let seenByOthers = false;
      await transact(sequelize, async (t) => {
        seenByOthers = false;
        const part = await findVisiblePart(actor, id, t);
        assertCanEdit(actor, part);
        const { visibility, ...content } = patch;
        // the edit form sends the visibility with every save: only a change is the author's alone
        const wanted = visibility === undefined ? undefined : visibility === 'everyone' ? null : visibility.crewId;
        if (wanted !== undefined && wanted !== part.crewId) {
          if (actor.id !== part.authorId) throw AppError.forbidden('Only the author chooses who sees a part.');
          await part.update({ crewId: await crewIdFor(actor, visibility, t) }, { transaction: t });
          seenByOthers = part.publishedRevisionId !== null;
        }
        if (visibility !== undefined && !Object.keys(content).length) return;
        if (patch.licence) await checkParentLicence(part.parentId, patch.licence, actor);
        const edit = await editableRevision(part, actor, t);
        const changes = editChanges(edit.revision, content);
        await edit.revision.update(revisionColumns(content), { transaction: t });
        if (bodyIds) await replaceBodies(edit.revision.id, bodyIds, t);
        if (patch.recipes) await replaceRecipes(edit.revision.id, patch.recipes, t);
        await afterEdit(actor, part, edit, t, { changes });
      });
      if (seenByOthers) onVisibilityChanged?.();
      return this.get(actor, id);
    },

    async addFiles(actor: User, id: string, files: InspectedFile[]) {
      if (!files.length) throw AppError.field('model', 'Choose at least one file to add.');
      // before the files travel to storage; checked again inside the write
      assertCanEdit(actor, await findVisiblePart(actor, id));
      await writeWithFiles(files, async (t, names) => {
        const part = await findVisiblePart(actor, id, t);
        assertCanEdit(actor, part);
        const edit = await editableRevision(part, actor, t);
        const rows = await attachFiles({ partId: part.id, revisionId: edit.revision.id, createdBy: actor.id, files, names }, t);
        await afterEdit(actor, part, edit, t, { changes: [], filesAdded: files.map((f) => f.originalName) });
        return { result: undefined, photos: rows };
      });
      return this.get(actor, id);
    },

    async removeFile(actor: User, id: string, fileId: number) {
      const orphan = await transact(sequelize, async (t) => {
        const part = await findVisiblePart(actor, id, t);
        assertCanEdit(actor, part);
        const edit = await editableRevision(part, actor, t);
        const revision = edit.revision;
        const links = await RevisionFile.findAll({ where: { revisionId: revision.id }, transaction: t });
        if (!links.some((l) => l.fileId === fileId)) throw AppError.notFound('That file is not part of this part.');
        const file = (await PartFile.findByPk(fileId, { transaction: t }))!;
        if (file.kind === 'model') {
          const models = await PartFile.count({ where: { id: { [Op.in]: links.map((l) => l.fileId) }, kind: 'model' }, transaction: t });
          if (models <= 1) throw AppError.conflict('A part needs at least one model file. Add the new model before removing this one.');
        }
        await RevisionFile.destroy({ where: { revisionId: revision.id, fileId }, transaction: t });
        await afterEdit(actor, part, edit, t, { changes: [], filesRemoved: [file.originalName] });
        const stillUsed = await RevisionFile.count({ where: { fileId }, transaction: t });
        if (stillUsed) return null;
        await file.destroy({ transaction: t });
        return file;
      });
      if (orphan) await removeStoredFiles(storage, orphan);
      return this.get(actor, id);
    },

    /** Sends a sent-back (or draft) revision to the review desk again without further changes. */
    async resubmit(actor: User, id: string) {
      await transact(sequelize, async (t) => {
        const part = await findVisiblePart(actor, id, t);
        assertCanEdit(actor, part);
        const latest = (await PartRevision.findByPk(part.latestRevisionId!, { transaction: t, lock: t.LOCK.UPDATE }))!;
        const step = transition(latest.status, 'submit');
        if (!step.ok) throw AppError.conflict(step.message);
        await afterEdit(actor, part, { revision: latest, created: false }, t, { changes: [{ field: 'status', before: latest.status, after: 'in_review' }] });
      });
      return this.get(actor, id);
    },

    /** A file of the revision this viewer sees, with its storage key. */
    async storedFile(viewer: User | undefined, id: string, fileId: number, want: 'original' | 'display' | 'thumbnail') {
      const part = await findVisiblePart(viewer, id);
      // a retired part's page stays up for reference (photos included), but its files are no longer
      // handed out to print from: only its author and moderators still get them
      if (want === 'original' && part.status === 'retired' && !seesUnpublished(viewer, part)) {
        throw AppError.notFound('That file is not part of this part.');
      }
      const revisionIds = seesUnpublished(viewer, part)
        ? (await PartRevision.findAll({ where: { partId: part.id }, attributes: ['id'] })).map((r) => r.id)
        : [part.publishedRevisionId!];
      const linked = await RevisionFile.count({ where: { fileId, revisionId: { [Op.in]: revisionIds } } });
      const file = linked ? await PartFile.findByPk(fileId) : null;
      if (!file) throw AppError.notFound('That file is not part of this part.');
      if (want !== 'original' && file.kind === 'source') throw AppError.notFound('Only photos and models have pictures.');
      if (want !== 'original' && file.kind === 'model' && file.renderStatus !== 'ready') {
        throw AppError.notFound(
          file.renderStatus === 'failed'
            ? 'No picture could be drawn from this model.'
            : 'The picture of this model is still being drawn; try again in a moment.',
        );
      }
      if (file.kind === 'photo' && file.processing !== 'ready') {
        throw AppError.notFound(
          file.processing === 'failed' ? 'This photo could not be processed.' : 'This photo is still being processed; try again in a moment.',
        );
      }
      const keys = keysOf(file);
      // a photo's original is never kept: its download is the cleaned display image
      const picture = want === 'thumbnail' ? keys.thumbnail! : keys.display!;
      const key = file.kind === 'photo' || want !== 'original' ? picture : keys.original;
      return { file, key };
    },
  };
}

export type PartsService = ReturnType<typeof createPartsService>;
