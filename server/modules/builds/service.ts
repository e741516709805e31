// A member's camera builds. Only the owner sees or changes a build; anyone else is told it does not
// exist (404), the same answer as for an id nobody has.
import { Op } from 'sequelize';
import type { BuildInfo } from '@shared/api/builds';
import { mountStandard } from '@shared/catalogue';
import { MAX_BUILDS, type BuildData, type BuildPatchData } from '@shared/schemas/builds';
import { Build, CameraBody, type User } from '../../db/models';
import { AppError } from '../../errors';
import { bodyInfo, resolveBody } from './bodies';

export const buildNotFound = () => AppError.notFound('There is no build with that id among yours. Open your builds to pick one.');

export function presentBuild(b: Build): BuildInfo {
  return {
    id: b.id,
    name: b.name,
    body: bodyInfo(b.body),
    mounts: b.mounts.map((slug) => ({ slug, label: mountStandard(slug)?.label ?? slug })),
    keySizes: b.keySizes.map((s) => ({ name: s.name, valueMm: s.valueMm, tolMm: s.tolMm })),
    createdAt: b.createdAt.toISOString(),
    updatedAt: b.updatedAt.toISOString(),
  };
}

const withBody = { include: [{ model: CameraBody, as: 'body' }] };

export const buildsService = {
  async list(owner: User): Promise<BuildInfo[]> {
    const rows = await Build.findAll({
      where: { ownerId: owner.id },
      ...withBody,
      order: [
        ['updatedAt', 'DESC'],
        ['id', 'DESC'],
      ],
    });
    return rows.map(presentBuild);
  },

  /** The owner's build, or 404 (also for someone else's). */
  async find(owner: User, id: number): Promise<Build> {
    const build = await Build.findOne({ where: { id, ownerId: owner.id }, ...withBody });
    if (!build) throw buildNotFound();
    return build;
  },

  async get(owner: User, id: number): Promise<BuildInfo> {
    return presentBuild(await this.find(owner, id));
  },

  async create(owner: User, input: BuildData): Promise<BuildInfo> {
    if ((await Build.count({ where: { ownerId: owner.id } })) >= MAX_BUILDS) {
      throw AppError.conflict(`You have ${MAX_BUILDS} builds, the most one member keeps. Delete one you no longer use first.`);
    }
    const body = await resolveBody(input.body);
    const build = await Build.create({ ownerId: owner.id, name: input.name, bodyId: body?.id ?? null, mounts: input.mounts, keySizes: input.keySizes });
    return this.get(owner, build.id);
  },

  async update(owner: User, id: number, patch: BuildPatchData): Promise<BuildInfo> {
    const build = await this.find(owner, id);
    const values: Partial<Pick<Build, 'name' | 'bodyId' | 'mounts' | 'keySizes'>> = {};
    if (patch.name !== undefined) values.name = patch.name;
    if (patch.body !== undefined) values.bodyId = (await resolveBody(patch.body ?? null))?.id ?? null;
    if (patch.mounts !== undefined) values.mounts = patch.mounts;
    if (patch.keySizes !== undefined) values.keySizes = patch.keySizes;
    await build.update(values);
    return this.get(owner, id);
  },

  async remove(owner: User, id: number): Promise<void> {
    const count = await Build.destroy({ where: { id, ownerId: owner.id } });
    if (!count) throw buildNotFound();
  },

  /** Several builds by id for one owner (unknown ids are left out). */
  async many(owner: User, ids: number[]): Promise<Build[]> {
    return Build.findAll({ where: { ownerId: owner.id, id: { [Op.in]: ids } }, ...withBody });
  },
};
