// Camera bodies as members name them in builds and wanted requests: the slug, "maker model", the
// model alone or an alias the admin set, with case, spaces and hyphens ignored ("kx8" = "KX-8").
import type { Transaction } from 'sequelize';
import { CameraBody } from '../../db/models';
import { AppError } from '../../errors';

const squash = (text: string) => text.normalize('NFKC').toLowerCase().replace(/[^a-z0-9]+/g, '');

function namesOf(b: CameraBody): string[] {
  return [b.slug, `${b.maker} ${b.model}`, b.model, ...b.aliases].map(squash).filter(Boolean);
}

/** The body a name stands for, or a 422 on `field` naming the bodies closest to what was typed. */
export async function resolveBody(name: string | null, field = 'body', transaction?: Transaction): Promise<CameraBody | null> {
  if (!name) return null;
  const bodies = await CameraBody.findAll({ order: [['maker', 'ASC'], ['model', 'ASC']], transaction });
  const wanted = squash(name);
  const found = bodies.find((b) => namesOf(b).includes(wanted));
  if (found) return found;
  // closest: bodies sharing a word or a run of characters with the typed name
  const words = name.toLowerCase().split(/[^a-z0-9]+/).filter((w) => w.length >= 2);
  const close = bodies.filter((b) => namesOf(b).some((n) => words.some((w) => n.includes(w)) || (wanted.length >= 2 && n.includes(wanted))));
  const offer = (close.length ? close : bodies).slice(0, 5).map((b) => `${b.maker} ${b.model}`);
  throw new AppError(422, 'validation_failed', 'Some fields need another look.', {
    [field]: offer.length ? `No camera body is called "${name}". Did you mean ${offer.join(', ')}?` : `No camera body is called "${name}"; an admin adds bodies to the list.`,
  });
}

export function bodyInfo(b: CameraBody | null | undefined) {
  return b ? { slug: b.slug, maker: b.maker, model: b.model } : null;
}
