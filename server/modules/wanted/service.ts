// Over 350 lines: one service whose seven operations share the visibility rule and the answer's
// notice-and-mail path; the next split would take the answers (answer, partPublished) into answers.ts.
// Wanted parts. Any member asks for a part nobody has put on the shelf yet (what it must fit, a photo
// or sketch, a needed-by date); members browse open requests and answer one by linking a part:
//   - any part on the shelf, whoever made it (pointing a crew to an existing part is an answer too);
//   - or a part of their own that is with the review desk (someone else's unpublished part stays
//     private to its author and the moderators, so it cannot be linked).
// The requester hears about an answer (notice and mail) once its part is on the shelf: at once for
// a published part, otherwise when the review desk approves it. Only the requester closes their
// request (solved or withdrawn); moderators may close any, and only they close one as spam, which
// hides it from everyone but its author and the moderators.
import { Op, UniqueConstraintError, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { WantedDetail, WantedListItem } from '@shared/api/wanted';
import { mountStandard } from '@shared/catalogue';
import { MAX_WANTED_PHOTOS, type WantedData, type WantedListQuery } from '@shared/schemas/wanted';
import { CameraBody, Part, PartRevision, User, WantedAnswer, WantedPhoto, WantedRequest } from '../../db/models';
import { AppError } from '../../errors';
import { transact } from '../../db/transaction';
import { bodyInfo, resolveBody } from '../builds/bodies';
import type { InspectedFile } from '../files/inspect';
import type { PhotoJobs } from '../files/photo-jobs';
import type { FileStorage } from '../files/storage';
import { keysOf, photoColumns, stageUploads } from '../files/stored-files';
import { mailTemplates } from '../mail/templates';
import { notices } from '../notices/service';
import { audienceOf, crewAllows, isModerator } from '../parts/access';
import type { MailQueue } from '../review/service';
import type { Alerts } from '../notices/alerts';

export interface WantedDeps {
  sequelize: Sequelize;
  storage: FileStorage;
  photos: PhotoJobs;
  mail: MailQueue;
  publicUrl: string;
  /** Tells the members who answered a request that it was closed. */
  alerts?: Alerts;
}

const notFound = () => AppError.notFound('There is no wanted request with that id. It may have been closed by a moderator.');
const person = (u: User | null | undefined, id: number) => ({ id, displayName: u?.displayName ?? '' });

/** Whether the viewer may see a request: spam is hidden from all but its author and moderators. */
function visibleTo(viewer: User, r: WantedRequest): boolean {
  return r.closeReason !== 'spam' || r.authorId === viewer.id || isModerator(viewer);
}

function photoUrls(requestId: number, p: WantedPhoto) {
  const ready = p.processing === 'ready';
  return {
    id: p.id,
    processing: p.processing,
    thumbnailUrl: ready ? `/api/wanted/${requestId}/photos/${p.id}/thumb` : null,
    displayUrl: ready ? `/api/wanted/${requestId}/photos/${p.id}/display` : null,
  };
}

function listItem(r: WantedRequest, answers: number): WantedListItem {
  const photo = (r.photos ?? []).find((p) => p.processing === 'ready');
  return {
    id: r.id,
    title: r.title,
    status: r.status,
    closeReason: r.closeReason,
    body: bodyInfo(r.body),
    mounts: r.mounts.map((slug) => ({ slug, label: mountStandard(slug)?.label ?? slug })),
    neededBy: r.neededBy,
    author: person(r.author, r.authorId),
    answers,
    thumbnail: photo ? photoUrls(r.id, photo).thumbnailUrl : null,
    createdAt: r.createdAt.toISOString(),
  };
}

/** The title a part shows: its published revision's on the shelf, else its latest one's. */
async function partTitle(part: Part, transaction?: Transaction): Promise<string> {
  const rev = await PartRevision.findByPk(part.publishedRevisionId ?? part.latestRevisionId!, { attributes: ['title'], transaction });
  return rev?.title ?? part.slug;
}

export function createWantedService({ sequelize, storage, photos, mail, publicUrl, alerts }: WantedDeps) {
  const requestLink = (id: number) => `${publicUrl}/wanted/${id}`;

  /** Tells the requester that an answer's part is on the shelf; once per answer, inside `t`. */
  async function tellRequester(answer: WantedAnswer, request: WantedRequest, part: Part, t: Transaction) {
    if (answer.notifiedAt || request.status !== 'open') return;
    await answer.update({ notifiedAt: new Date() }, { transaction: t });
    if (answer.userId === request.authorId) return;
    const requester = await User.findByPk(request.authorId, { transaction: t });
    if (!requester || !crewAllows(await audienceOf(requester, t), part)) return;
    const answerer = await User.findByPk(answer.userId, { transaction: t });
    const title = await partTitle(part, t);
    await notices.notify(
      [requester.id],
      {
        kind: 'wanted',
        title: `A part for your request: ${request.title}`,
        body: `${answerer?.displayName ?? 'A crew member'} pointed to “${title}”, on the shelf now.`,
        link: `/wanted/${request.id}`,
      },
      t,
    );
    await mail.enqueue(
      requester.email,
      mailTemplates.wantedAnswered({
        requestTitle: request.title,
        partTitle: title,
        answeredBy: answerer?.displayName ?? 'A crew member',
        note: answer.note || null,
        partLink: `${publicUrl}/parts/${part.slug}`,
        requestLink: requestLink(request.id),
      }),
      t,
    );
  }

  async function loadVisible(viewer: User, id: number, transaction?: Transaction, lock = false): Promise<WantedRequest> {
    const r = await WantedRequest.findByPk(id, { transaction, lock: lock && transaction ? transaction.LOCK.UPDATE : undefined });
    if (!r || !visibleTo(viewer, r)) throw notFound();
    return r;
  }

  return {
    async create(actor: User, input: WantedData, files: InspectedFile[]): Promise<{ id: number }> {
      if (files.some((f) => f.field !== 'photo')) {
        throw AppError.field('photo', 'Attach a photo or a sketch as JPEG, PNG or WebP.', 'A wanted request takes photos or sketches only.');
      }
      if (files.length > MAX_WANTED_PHOTOS) {
        throw AppError.field('photo', `Attach at most ${MAX_WANTED_PHOTOS} photos or sketches.`, 'Some fields need another look.');
      }
      const body = await resolveBody(input.body);
      const staged = await stageUploads(
        storage,
        files.map((f) => ({ path: f.path, kind: 'photo' as const, extension: '' })),
      );
      const filed = await staged.settle(
        transact(sequelize, async (t) => {
          const request = await WantedRequest.create(
            {
              authorId: actor.id,
              title: input.title,
              details: input.details,
              bodyId: body?.id ?? null,
              mounts: input.mounts,
              keySizes: input.keySizes,
              neededBy: input.neededBy,
              searchedFor: input.searchedFor,
              closeReason: null,
              closeNote: null,
              closedAt: null,
              closedBy: null,
            },
            { transaction: t },
          );
          const rows: WantedPhoto[] = [];
          for (const columns of photoColumns(files, staged.names))
            rows.push(await WantedPhoto.create({ requestId: request.id, ...columns }, { transaction: t }));
          return { id: request.id, rows };
        }),
      );
      for (const row of filed.rows) photos.clean(row, () => WantedPhoto.findByPk(row.id));
      return { id: filed.id };
    },

    async list(viewer: User, query: WantedListQuery): Promise<WantedListItem[]> {
      const where: WhereOptions<WantedRequest> =
        query.status === 'mine'
          ? { authorId: viewer.id }
          : query.status === 'open'
            ? { status: 'open' }
            : isModerator(viewer)
              ? { status: 'closed' }
              : { status: 'closed', [Op.or]: [{ closeReason: { [Op.ne]: 'spam' } }, { authorId: viewer.id }] };
      const rows = await WantedRequest.findAll({
        where,
        include: [
          { model: User, as: 'author', attributes: ['id', 'displayName'] },
          { model: CameraBody, as: 'body' },
          { model: WantedPhoto, as: 'photos', separate: true },
        ],
        // open requests: the nearest needed-by date first, then the newest
        order:
          query.status === 'open'
            ? [
                [sequelize.literal('`WantedRequest`.`needed_by` IS NULL'), 'ASC'],
                ['neededBy', 'ASC'],
                ['createdAt', 'DESC'],
                ['id', 'DESC'],
              ]
            : [
                ['createdAt', 'DESC'],
                ['id', 'DESC'],
              ],
        limit: query.limit,
      });
      const counts = rows.length
        ? ((await WantedAnswer.count({ where: { requestId: { [Op.in]: rows.map((r) => r.id) } }, group: ['requestId'] })) as unknown as {
            requestId: number;
            count: number;
          }[])
        : [];
      const byId = new Map(counts.map((c) => [c.requestId, Number(c.count)]));
      return rows.map((r) => listItem(r, byId.get(r.id) ?? 0));
    },

    async detail(viewer: User, id: number): Promise<WantedDetail> {
      const found = await loadVisible(viewer, id);
      const r = (await WantedRequest.findByPk(found.id, {
        include: [
          { model: User, as: 'author', attributes: ['id', 'displayName'] },
          { model: User, as: 'closer', attributes: ['id', 'displayName'] },
          { model: CameraBody, as: 'body' },
          { model: WantedPhoto, as: 'photos' },
          {
            model: WantedAnswer,
            as: 'answers',
            include: [
              { model: User, as: 'user', attributes: ['id', 'displayName'] },
              { model: Part, as: 'part' },
            ],
          },
        ],
        order: [
          [{ model: WantedPhoto, as: 'photos' }, 'id', 'ASC'],
          [{ model: WantedAnswer, as: 'answers' }, 'id', 'ASC'],
        ],
      }))!;
      const answers = r.answers ?? [];
      const audience = await audienceOf(viewer);
      const answerList = [];
      for (const a of answers) {
        const part = a.part!;
        if (!crewAllows(audience, part)) continue;
        const onShelf = part.publishedRevisionId !== null && part.status === 'published';
        // an answer whose part left the desk unpublished (sent back, rejected) shows to its answerer and moderators only
        if (!onShelf && part.status !== 'in_review' && a.userId !== viewer.id && !isModerator(viewer)) continue;
        answerList.push({
          id: a.id,
          note: a.note,
          answeredBy: person(a.user, a.userId),
          createdAt: a.createdAt.toISOString(),
          part: { id: part.id, slug: part.slug, title: await partTitle(part), status: part.status, onShelf },
        });
      }
      const own = r.authorId === viewer.id;
      return {
        ...listItem(r, answerList.length),
        details: r.details,
        keySizes: r.keySizes,
        searchedFor: r.searchedFor,
        closedAt: r.closedAt?.toISOString() ?? null,
        closedBy: r.closedBy ? person(r.closer, r.closedBy) : null,
        closeNote: r.closeNote,
        photos: (r.photos ?? []).map((p) => photoUrls(r.id, p)),
        answerList,
        can: {
          answer: r.status === 'open',
          close: r.status === 'open' && (own || isModerator(viewer)),
          closeAsSpam: r.status === 'open' && isModerator(viewer),
        },
      };
    },

    async answer(actor: User, id: number, input: { part: string; note: string }) {
      return sequelize.transaction(async (t) => {
        const request = await loadVisible(actor, id, t, true);
        if (request.status !== 'open') throw AppError.conflict('This request is closed; it takes no more answers.');
        const where = /^\d+$/.test(input.part) ? { id: Number(input.part) } : { slug: input.part.replace(/^.*\/parts\//, '').replace(/[/?#].*$/, '') };
        const part = await Part.findOne({ where, transaction: t });
        const onShelf = !!part && part.publishedRevisionId !== null && part.status === 'published';
        const own = !!part && part.authorId === actor.id;
        if (!part || !crewAllows(await audienceOf(actor, t), part) || (!onShelf && !own && !isModerator(actor))) {
          throw AppError.field(
            'part',
            'There is no part with that id or address on the shelf. Link a published part, or one of yours that is in review.',
            'Some fields need another look.',
          );
        }
        if (!onShelf && part.status !== 'in_review') {
          throw AppError.field(
            'part',
            part.status === 'draft' || part.status === 'sent_back'
              ? 'That part is not with the review desk yet. Submit it for review, then link it here.'
              : 'That part is not on the shelf and will not be; link another one.',
            'Some fields need another look.',
          );
        }
        if (!onShelf && !own) {
          throw AppError.field('part', 'A part in review can be linked by its author only. Link a published part instead.', 'Some fields need another look.');
        }
        if (part.crewId != null) {
          const requester = await User.findByPk(request.authorId, { transaction: t });
          if (!requester || !crewAllows(await audienceOf(requester, t), part)) {
            throw AppError.field(
              'part',
              'That part is published to a crew the person who asked is not in, so they could not open it. Link a part published to everyone, or ask them to join the crew.',
              'Some fields need another look.',
            );
          }
        }
        let answer: WantedAnswer;
        try {
          answer = await WantedAnswer.create(
            { requestId: request.id, partId: part.id, userId: actor.id, note: input.note, notifiedAt: null },
            { transaction: t },
          );
        } catch (err) {
          if (err instanceof UniqueConstraintError) throw AppError.conflict('That part is already linked to this request.');
          throw err;
        }
        if (onShelf) await tellRequester(answer, request, part, t);
        return { id: answer.id, onShelf };
      });
    },

    async close(actor: User, id: number, input: { reason: 'solved' | 'withdrawn' | 'spam'; note: string }) {
      return sequelize.transaction(async (t) => {
        const request = await loadVisible(actor, id, t, true);
        const own = request.authorId === actor.id;
        if (!own && !isModerator(actor)) throw AppError.forbidden('Only the crew member who asked can close this request; moderators close spam.');
        if (input.reason === 'spam' && !isModerator(actor))
          throw AppError.forbidden('Only a moderator can close a request as spam. Close it as solved or withdrawn.');
        if (request.status !== 'open') throw AppError.conflict('This request is already closed.');
        await request.update(
          { status: 'closed', closeReason: input.reason, closeNote: input.note || null, closedAt: new Date(), closedBy: actor.id },
          { transaction: t },
        );
        if (!own) {
          await notices.notify(
            [request.authorId],
            {
              kind: 'wanted',
              title: `Request closed by a moderator: ${request.title}`,
              body: input.note || (input.reason === 'spam' ? 'Closed as spam.' : 'No note from the moderator.'),
              link: `/wanted/${request.id}`,
            },
            t,
          );
        }
        if (alerts && input.reason !== 'spam') {
          const answerers = (await WantedAnswer.findAll({ where: { requestId: request.id }, attributes: ['userId'], transaction: t })).map((a) => a.userId);
          const how = input.reason === 'solved' ? 'closed it as solved' : 'withdrew it';
          await alerts.send(
            answerers.filter((id) => id !== request.authorId),
            'wanted_closed',
            {
              title: `A request you answered is closed: ${request.title}`,
              body: `${actor.displayName} ${how}.${input.note ? ` “${input.note}”` : ''}`,
              link: `/wanted/${request.id}`,
              mail: { subject: `Closed: ${request.title}`, heading: 'A wanted request you answered is closed', actionLabel: 'See the request' },
            },
            t,
            actor.id,
          );
        }
        return { id: request.id, status: 'closed' as const, closeReason: input.reason };
      });
    },

    /** The review desk approved `part` (inside its transaction): answers linking it are on the shelf now. */
    async partPublished(part: Part, t: Transaction): Promise<void> {
      const answers = await WantedAnswer.findAll({ where: { partId: part.id, notifiedAt: { [Op.is]: null } }, transaction: t });
      for (const answer of answers) {
        const request = await WantedRequest.findByPk(answer.requestId, { transaction: t });
        if (request) await tellRequester(answer, request, part, t);
      }
    },

    async photoKey(viewer: User, id: number, photoId: number, size: 'thumb' | 'display'): Promise<string> {
      const request = await loadVisible(viewer, id);
      const photo = await WantedPhoto.findOne({ where: { id: photoId, requestId: request.id, processing: 'ready' } });
      if (!photo) throw AppError.notFound('There is no such photo.');
      const keys = keysOf({ kind: 'photo', storedName: photo.storedName });
      return size === 'thumb' ? keys.thumbnail! : keys.display!;
    },

    /** Wanted photos left half-cleaned by a crash (the start-up sweep keeps their raw uploads). */
    resume(rows: WantedPhoto[]) {
      for (const row of rows) photos.clean(row, () => WantedPhoto.findByPk(row.id));
    },
  };
}

export type WantedService = ReturnType<typeof createWantedService>;
