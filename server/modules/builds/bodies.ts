// Camera bodies as members name them in builds and wanted requests: the slug, "maker model", the
// model alone or an alias the admin set, however spaced (the same rule as search's body filter,
// shared/search/bodies.ts).
import type { Transaction } from 'sequelize';
import { resolveBody as resolveBodyName } from '@shared/search/bodies';
import { CameraBody } from '../../db/models';
import { AppError } from '../../errors';

/** The body a name stands for, or a 422 on `field` naming the bodies closest to what was typed. */
export async function resolveBody(name: string | null, field = 'body', transaction?: Transaction): Promise<CameraBody | null> {
  if (!name) return null;
  const bodies = await CameraBody.findAll({
    order: [
      ['maker', 'ASC'],
      ['model', 'ASC'],
    ],
    transaction,
  });
  const found = resolveBodyName(name, bodies);
  if (found.ok) return bodies.find((b) => b.slug === found.slug)!;
  throw AppError.field(
    field,
    found.closest.length
      ? `No camera body is called "${name}". Did you mean ${found.closest.join(', ')}?`
      : `No camera body is called "${name}"; an admin adds bodies to the list.`,
    'Some fields need another look.',
  );
}

export function bodyInfo(b: CameraBody | null | undefined) {
  return b ? { slug: b.slug, maker: b.maker, model: b.model } : null;
}
