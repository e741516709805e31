// Who may see and change a part. The server enforces these; the client only mirrors them.
import type { Transaction } from 'sequelize';
import { Part, type User } from '../../db/models';
import { AppError } from '../../errors';

export function isModerator(user: User | undefined | null): boolean {
  return !!user && (user.role === 'moderator' || user.role === 'admin');
}

/** Authors and moderators see every revision; everyone else only what is published. */
export function seesUnpublished(viewer: User | undefined | null, part: Part): boolean {
  return !!viewer && (viewer.id === part.authorId || isModerator(viewer));
}

export function isOnShelf(part: Part): boolean {
  return part.publishedRevisionId !== null;
}

const notFound = () => AppError.notFound('There is no part with that id on the shelf.');

/** Finds a part by id or slug, answering 404 (not 403) when the viewer may not know it exists. */
export async function findVisiblePart(viewer: User | undefined, idOrSlug: string | number, transaction?: Transaction): Promise<Part> {
  const where = typeof idOrSlug === 'number' || /^\d+$/.test(idOrSlug) ? { id: Number(idOrSlug) } : { slug: idOrSlug };
  const part = await Part.findOne({ where, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!part) throw notFound();
  if (!isOnShelf(part) && !seesUnpublished(viewer, part)) throw notFound();
  return part;
}

export function assertCanEdit(actor: User, part: Part): void {
  if (actor.id !== part.authorId && !isModerator(actor)) {
    throw AppError.forbidden('Only the author of this part or a moderator can change it.');
  }
  if (part.status === 'rejected') throw AppError.conflict('This part was rejected; that decision is final. Submit a new part instead.');
  if (part.status === 'retired') throw AppError.conflict('This part has been retired from the shelf and can no longer be changed.');
}
