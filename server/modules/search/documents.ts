// Turns the published shelf into plain search documents, and fingerprints the published set so a
// saved index can be checked against the database at start-up.
import { createHash } from 'node:crypto';
import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { CATEGORIES, MOUNT_STANDARDS } from '@shared/catalogue';
import { adaptationRule, isLicenceId } from '@shared/licences';
import type { SizeMm } from '@shared/search/filters';
import { CameraBody, Part, PartFile, PartRevision, Recipe, RevisionBody, RevisionFile } from '../../db/models';
import { coverThumbnail } from '../parts/presenter';
import { FIELD_BOOSTS, SEARCH_FORMAT, type SearchBody, type SearchDocument } from './index-builder';

const CHUNK = 2000;

async function inChunks<T>(ids: number[], load: (chunk: number[]) => Promise<T[]>): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < ids.length; i += CHUNK) out.push(...(await load(ids.slice(i, i + CHUNK))));
  return out;
}

/** Parts anyone can find: on the shelf with a published revision. Retired parts are not. */
const PUBLISHED = { status: 'published', publishedRevisionId: { [Op.ne]: null } } as const;

/**
 * sha256 over everything a document is made of: the published parts (id, published revision,
 * status, publishedAt) and their revisions' last change, the files those revisions show (photos
 * turn ready later), the camera-body vocabulary, and our own vocabularies and index format.
 * Unpublished edits of a published part do not change it: they do not change what search shows.
 */
export async function publishedFingerprint(sequelize: Sequelize): Promise<string> {
  const select = <T extends object>(sql: string) => sequelize.query<T>(sql, { type: QueryTypes.SELECT });
  const parts = await select(
    `SELECT p.id, p.published_revision_id AS rev, p.status, p.published_at AS publishedAt, p.crew_id AS crew, r.updated_at AS revisionUpdatedAt
       FROM parts p JOIN part_revisions r ON r.id = p.published_revision_id
      WHERE p.status = 'published' ORDER BY p.id`,
  );
  const files = await select(
    `SELECT rf.revision_id AS rev, rf.file_id AS file, rf.position, f.processing, f.render_status AS picture
       FROM revision_files rf
       JOIN parts p ON p.published_revision_id = rf.revision_id AND p.status = 'published'
       JOIN part_files f ON f.id = rf.file_id
      ORDER BY rf.revision_id, rf.position, rf.file_id`,
  );
  const bodies = await select(`SELECT id, slug, updated_at AS updatedAt FROM camera_bodies ORDER BY id`);
  const hash = createHash('sha256');
  hash.update(JSON.stringify({ format: SEARCH_FORMAT, boosts: FIELD_BOOSTS, mounts: MOUNT_STANDARDS, categories: CATEGORIES }));
  for (const rows of [parts, files, bodies]) hash.update(JSON.stringify(rows));
  return hash.digest('hex');
}

/** Every camera body on the list, named or not by a published part (for names in search). */
export async function loadBodies(): Promise<SearchBody[]> {
  const rows = await CameraBody.findAll({ order: [['id', 'ASC']] });
  return rows.map((b) => ({ slug: b.slug, maker: b.maker, model: b.model, aliases: b.aliases }));
}

export async function loadDocuments(): Promise<SearchDocument[]> {
  const parts = await Part.findAll({ where: PUBLISHED, order: [['id', 'ASC']] });
  const revisionIds = parts.map((p) => p.publishedRevisionId!);

  const revisions = new Map((await inChunks(revisionIds, (ids) => PartRevision.findAll({ where: { id: { [Op.in]: ids } } }))).map((r) => [r.id, r]));
  const bodyLinks = await inChunks(revisionIds, (ids) => RevisionBody.findAll({ where: { revisionId: { [Op.in]: ids } }, raw: true }));
  const bodyIds = [...new Set(bodyLinks.map((l) => (l as unknown as { bodyId: number }).bodyId))];
  const bodies = new Map((await inChunks(bodyIds, (ids) => CameraBody.findAll({ where: { id: { [Op.in]: ids } } }))).map((b) => [b.id, b]));
  const recipes = await inChunks(revisionIds, (ids) =>
    Recipe.findAll({ where: { revisionId: { [Op.in]: ids } }, attributes: ['revisionId', 'material', 'position'], order: [['position', 'ASC']] }),
  );
  const fileLinks = await inChunks(revisionIds, (ids) =>
    RevisionFile.findAll({
      where: { revisionId: { [Op.in]: ids } },
      order: [
        ['position', 'ASC'],
        ['fileId', 'ASC'],
      ],
    }),
  );
  const files = new Map(
    (await inChunks([...new Set(fileLinks.map((l) => l.fileId))], (ids) => PartFile.findAll({ where: { id: { [Op.in]: ids } } }))).map((f) => [f.id, f]),
  );

  const group = <T>(rows: T[], key: (row: T) => number) => {
    const map = new Map<number, T[]>();
    for (const row of rows) {
      const list = map.get(key(row));
      if (list) list.push(row);
      else map.set(key(row), [row]);
    }
    return map;
  };
  const bodiesOf = group(bodyLinks as unknown as { revisionId: number; bodyId: number }[], (l) => l.revisionId);
  const recipesOf = group(recipes, (r) => r.revisionId);
  const filesOf = group(fileLinks, (l) => l.revisionId);

  return parts.flatMap((part): SearchDocument[] => {
    const rev = revisions.get(part.publishedRevisionId!);
    if (!rev) return [];
    const revFiles = (filesOf.get(rev.id) ?? []).map((l) => files.get(l.fileId)).filter((f): f is PartFile => !!f);
    const model = revFiles.find((f) => f.kind === 'model' && f.analysis);
    const docBodies: SearchBody[] = (bodiesOf.get(rev.id) ?? [])
      .map((l) => bodies.get(l.bodyId))
      .filter((b): b is CameraBody => !!b)
      .map((b) => ({ slug: b.slug, maker: b.maker, model: b.model, aliases: b.aliases }));
    const size = model?.analysis?.sizeMm;
    return [
      {
        id: part.id,
        slug: part.slug,
        title: rev.title,
        summary: rev.summary,
        description: rev.descriptionMd,
        category: rev.category,
        bodies: docBodies,
        mounts: rev.mounts.map((m) => (m.note ? { slug: m.slug, note: m.note } : { slug: m.slug })),
        materials: [...new Set((recipesOf.get(rev.id) ?? []).map((r) => r.material))],
        keyDimensions: rev.keyDimensions.map((d) => ({ name: d.name, valueMm: d.valueMm, tolMm: d.tolMm })),
        sizeMm: size ? ([size[0], size[1], size[2]] as SizeMm) : null,
        thumbnail: coverThumbnail(part.id, revFiles),
        licence: rev.licence,
        adaptable: isLicenceId(rev.licence) ? adaptationRule(rev.licence).allowed : false,
        publishedAt: (part.publishedAt ?? rev.updatedAt).toISOString(),
        publishedRevisionId: rev.id,
        rating: null,
        crewId: part.crewId ?? null,
      },
    ];
  });
}
