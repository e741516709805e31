import { UniqueConstraintError } from 'sequelize';
import { slugify } from '@shared/catalogue';
import type { CameraBodyInput } from '@shared/schemas/vocab';
import { CameraBody, RevisionBody } from '../../db/models';
import { AppError } from '../../errors';

async function find(slug: string): Promise<CameraBody> {
  const body = await CameraBody.findOne({ where: { slug } });
  if (!body) throw AppError.notFound('There is no camera body with that slug.');
  return body;
}

export const cameraBodies = {
  async create(input: CameraBodyInput): Promise<CameraBody> {
    try {
      return await CameraBody.create({ ...input, slug: slugify(`${input.maker} ${input.model}`) });
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw AppError.conflict(`${input.maker} ${input.model} is already on the list.`);
      throw err;
    }
  },

  async update(slug: string, patch: Partial<CameraBodyInput>): Promise<CameraBody> {
    const body = await find(slug);
    return body.update(patch);
  },

  async remove(slug: string): Promise<void> {
    const body = await find(slug);
    const uses = await RevisionBody.count({ where: { bodyId: body.id } });
    if (uses) throw AppError.conflict(`${body.maker} ${body.model} is named by ${uses} part revision(s); rename it instead of removing it.`);
    await body.destroy();
  },
};
