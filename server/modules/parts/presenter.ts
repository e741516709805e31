// The JSON a part is shown as. One shape for the part page, the submit flow and later the review desk.
import { Op } from 'sequelize';
import { categoryLabel, mountStandard, type SafetyFlags } from '@shared/catalogue';
import { adaptationRule, isLicenceId, licenceInfo } from '@shared/licences';
import { recipeWindowWarnings } from '@shared/materials';
import { safetyCautions } from '@shared/safety';
import type { PartFileInfo, PartSummary } from '@shared/types';
import type { PartVisibilityInfo } from '@shared/api/crews';
import { CameraBody, Crew, Part, PartFile, PartRevision, Recipe, RevisionFile, User } from '../../db/models';
import { madeWith } from '../make/made';
import { audienceOf, crewAllows, crewWhere, seesUnpublished } from './access';

export function fileUrls(partId: number, file: Pick<PartFile, 'id' | 'kind' | 'processing' | 'renderStatus'>) {
  const base = `/api/parts/${partId}/files/${file.id}`;
  // a photo's cleaned sizes, or a model's drawn picture
  const pictureReady = (file.kind === 'photo' && file.processing === 'ready') || (file.kind === 'model' && file.renderStatus === 'ready');
  return {
    downloadUrl: `${base}/download`,
    thumbnailUrl: pictureReady ? `${base}/image/thumb` : null,
    displayUrl: pictureReady ? `${base}/image/display` : null,
  };
}

/** The picture a part is shown by: its first cleaned photo, else the drawn picture of its first model. */
export function coverFile<F extends Pick<PartFile, 'id' | 'kind' | 'processing' | 'renderStatus'>>(files: F[]): F | null {
  return files.find((f) => f.kind === 'photo' && f.processing === 'ready') ?? files.find((f) => f.kind === 'model' && f.renderStatus === 'ready') ?? null;
}

/** The cover's thumbnail URL, or null when the part has no picture yet. */
export function coverThumbnail(partId: number, files: Pick<PartFile, 'id' | 'kind' | 'processing' | 'renderStatus'>[]): string | null {
  const cover = coverFile(files);
  return cover ? fileUrls(partId, cover).thumbnailUrl : null;
}

export function presentFile(partId: number, file: PartFile): PartFileInfo {
  const a = file.analysis;
  return {
    id: file.id,
    kind: file.kind,
    name: file.originalName,
    sizeBytes: file.sizeBytes,
    sha256: file.sha256,
    format: file.format,
    analysis: a
      ? {
          sizeMm: a.sizeMm,
          volumeMm3: a.volumeMm3,
          areaMm2: a.areaMm2,
          facets: a.facets,
          watertight: a.watertight,
          shells: a.shells,
          insideOut: a.insideOut,
          degenerateFacets: a.degenerateFacets,
          openEdges: a.openEdges,
          nonManifoldEdges: a.nonManifoldEdges,
          zeroAreaFacets: a.zeroAreaFacets ?? null,
          windingConsistent: a.windingConsistent ?? null,
          reversedFacets: a.reversedFacets ?? null,
          insideOutShells: a.insideOutShells ?? null,
          volumeRepaired: a.volumeRepaired ?? null,
          weldedVertices: a.weldedVertices ?? null,
          weldToleranceMm: a.weldToleranceMm ?? null,
          warnings: a.warnings,
        }
      : null,
    processing: file.processing,
    picture: file.kind === 'model' ? (file.renderStatus ?? null) : null,
    ...fileUrls(partId, file),
  };
}

export async function loadRevision(id: number) {
  return PartRevision.findByPk(id, {
    include: [
      { model: CameraBody, as: 'bodies', through: { attributes: [] } },
      { model: Recipe, as: 'recipes' },
      { model: PartFile, as: 'files', through: { attributes: ['position'] } },
    ],
    order: [
      [{ model: Recipe, as: 'recipes' }, 'position', 'ASC'],
      [{ model: PartFile, as: 'files' }, RevisionFile, 'position', 'ASC'],
    ],
  });
}

function licenceOf(id: string) {
  if (!isLicenceId(id)) return { id, name: id, url: '', shortName: id, creditDuty: '' };
  const info = licenceInfo(id);
  return { id, name: info.name, shortName: info.shortName, url: info.url, creditDuty: info.creditDuty };
}

function flagsOf(rev: PartRevision): SafetyFlags {
  return { carriesLoad: rev.carriesLoad, overhead: rev.overhead, vehicle: rev.vehicle, heat: rev.heat };
}

async function lineageOf(part: Part, viewer: User | undefined) {
  const audience = await audienceOf(viewer);
  let parent = null;
  if (part.parentId) {
    const p = await Part.findByPk(part.parentId, { include: [{ model: User, as: 'author' }] });
    if (p && crewAllows(audience, p) && (p.publishedRevisionId || seesUnpublished(viewer, p))) {
      const rev = await PartRevision.findByPk(p.publishedRevisionId ?? p.latestRevisionId!);
      parent = {
        id: p.id,
        slug: p.slug,
        title: rev?.title ?? p.slug,
        author: { id: p.authorId, displayName: p.author?.displayName ?? '' },
        licence: rev ? licenceOf(rev.licence) : null,
      };
    }
  }
  const children = await Part.findAll({
    where: { [Op.and]: [{ parentId: part.id, publishedRevisionId: { [Op.ne]: null } }, crewWhere(audience)] },
    include: [
      { model: User, as: 'author' },
      { model: PartRevision, as: 'publishedRevision' },
    ],
    order: [['publishedAt', 'ASC']],
  });
  return {
    parent,
    adaptations: children.map((c) => ({
      id: c.id,
      slug: c.slug,
      title: c.publishedRevision?.title ?? c.slug,
      author: { id: c.authorId, displayName: c.author?.displayName ?? '' },
    })),
  };
}

/** Who sees the part: 'everyone', or the crew it is published to. */
export async function visibilityOf(part: Part): Promise<PartVisibilityInfo> {
  if (part.crewId == null) return 'everyone';
  const crew = await Crew.findByPk(part.crewId, { attributes: ['id', 'name'] });
  return { crewId: part.crewId, crewName: crew?.name ?? '' };
}

export async function presentPart(part: Part, revisionId: number, viewer: User | undefined) {
  const rev = (await loadRevision(revisionId))!;
  const author = await User.findByPk(part.authorId);
  const flags = flagsOf(rev);
  const licence = licenceOf(rev.licence);
  const files = (rev.files ?? []).map((f) => presentFile(part.id, f));
  const model = files.find((f) => f.kind === 'model' && f.analysis);
  return {
    id: part.id,
    slug: part.slug,
    status: part.status,
    revision: { id: rev.id, number: rev.number, status: rev.status, submittedAt: rev.submittedAt?.toISOString() ?? null },
    publishedRevisionId: part.publishedRevisionId,
    latestRevisionId: part.latestRevisionId,
    publishedAt: part.publishedAt?.toISOString() ?? null,
    createdAt: part.createdAt.toISOString(),
    updatedAt: rev.updatedAt.toISOString(),
    author: { id: part.authorId, displayName: author?.displayName ?? '', crewRole: author?.crewRole ?? null },
    title: rev.title,
    summary: rev.summary,
    description: rev.descriptionMd,
    descriptionHtml: rev.descriptionHtml,
    category: { slug: rev.category, label: categoryLabel(rev.category) },
    compatibility: {
      bodies: (rev.bodies ?? []).map((b) => b.toInfo()),
      mounts: rev.mounts.map((m) => ({ ...m, label: mountStandard(m.slug)?.label ?? m.slug, standard: mountStandard(m.slug)?.standard ?? '' })),
      keyDimensions: rev.keyDimensions,
    },
    safety: {
      ...flags,
      testedLoadKg: rev.testedLoadKg,
      cautions: safetyCautions(
        flags,
        rev.testedLoadKg,
        (rev.recipes ?? []).map((r) => r.material),
      ),
    },
    licence: { ...licence, adaptation: isLicenceId(rev.licence) ? adaptationRule(rev.licence) : null },
    recipes: (rev.recipes ?? []).map((r) => ({ id: r.id, ...r.toInput(), warnings: recipeWindowWarnings(r) })),
    files,
    sizeMm: model?.analysis?.sizeMm ?? null,
    lineage: await lineageOf(part, viewer),
    madeWith: rev.makeKind ? madeWith(rev.makeKind, rev.makeParams ?? {}) : null,
    visibility: await visibilityOf(part),
  };
}

export type PartDetail = Awaited<ReturnType<typeof presentPart>>;

const positionOf = (f: PartFile) => (f as PartFile & { RevisionFile?: { position: number } }).RevisionFile?.position ?? 0;

export async function presentSummaries(parts: Part[], pickRevision: (p: Part) => number | null): Promise<PartSummary[]> {
  const ids = parts.map(pickRevision).filter((id): id is number => id !== null);
  const revisions = await PartRevision.findAll({
    where: { id: { [Op.in]: ids } },
    include: [{ model: PartFile, as: 'files', through: { attributes: ['position'] } }],
  });
  const authors = await User.findAll({ where: { id: { [Op.in]: [...new Set(parts.map((p) => p.authorId))] } } });
  return parts.flatMap((part) => {
    const rev = revisions.find((r) => r.id === pickRevision(part));
    if (!rev) return [];
    const files = [...(rev.files ?? [])].sort((a, b) => positionOf(a) - positionOf(b));
    const model = files.find((f) => f.kind === 'model' && f.analysis);
    return [
      {
        id: part.id,
        slug: part.slug,
        title: rev.title,
        summary: rev.summary,
        status: part.status,
        category: rev.category,
        author: { id: part.authorId, displayName: authors.find((a) => a.id === part.authorId)?.displayName ?? '' },
        thumbnailUrl: coverThumbnail(part.id, files),
        sizeMm: model?.analysis?.sizeMm ?? null,
        updatedAt: rev.updatedAt.toISOString(),
        crewId: part.crewId ?? null,
      },
    ];
  });
}
