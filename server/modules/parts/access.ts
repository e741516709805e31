// Who may see and change a part. The server enforces these; the client only mirrors them.
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import { CrewMember, Part, type User } from '../../db/models';
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

/**
 * Who a viewer is for crew-only parts: moderators and admins see every crew's parts; a member sees
 * the parts of the crews they are in, and their own; a visitor none.
 */
export interface PartAudience {
  all: boolean;
  userId: number | null;
  crewIds: number[];
}

export async function audienceOf(viewer: User | undefined | null, transaction?: Transaction): Promise<PartAudience> {
  if (!viewer) return { all: false, userId: null, crewIds: [] };
  if (isModerator(viewer)) return { all: true, userId: viewer.id, crewIds: [] };
  const rows = await CrewMember.findAll({ where: { userId: viewer.id }, attributes: ['crewId'], transaction });
  return { all: false, userId: viewer.id, crewIds: rows.map((r) => r.crewId) };
}

/** Whether the part's crew rule lets the audience see it (the shelf and review rules still apply). */
export function crewAllows(audience: PartAudience, part: Pick<Part, 'crewId' | 'authorId'>): boolean {
  if (part.crewId == null || audience.all) return true;
  return audience.crewIds.includes(part.crewId) || (audience.userId !== null && part.authorId === audience.userId);
}

/** The same rule as a `where` on parts (column names of the Part model; prefix for an include). */
export function crewWhere(audience: PartAudience): WhereOptions {
  if (audience.all) return {};
  const allowed: WhereOptions[] = [{ crewId: null }];
  if (audience.crewIds.length) allowed.push({ crewId: { [Op.in]: audience.crewIds } });
  if (audience.userId !== null) allowed.push({ authorId: audience.userId });
  return { [Op.or]: allowed };
}

/** The same rule for the search worker: which crews' parts a search may return. */
export function searchVisibility(audience: PartAudience): { crews: 'all' | number[] } {
  return { crews: audience.all ? 'all' : audience.crewIds };
}

/** Whether the viewer may see this part at all (crew rule, then the shelf rule). */
export async function canSeePart(viewer: User | undefined | null, part: Part, transaction?: Transaction): Promise<boolean> {
  if (part.crewId != null && !crewAllows(await audienceOf(viewer, transaction), part)) return false;
  return isOnShelf(part) || seesUnpublished(viewer, part);
}

const notFound = () => AppError.notFound('There is no part with that id on the shelf.');

/** Finds a part by id or slug, answering 404 (not 403) when the viewer may not know it exists. */
export async function findVisiblePart(viewer: User | undefined, idOrSlug: string | number, transaction?: Transaction): Promise<Part> {
  const where = typeof idOrSlug === 'number' || /^\d+$/.test(idOrSlug) ? { id: Number(idOrSlug) } : { slug: idOrSlug };
  const part = await Part.findOne({ where, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!part) throw notFound();
  if (!(await canSeePart(viewer, part, transaction))) throw notFound();
  return part;
}

export function assertCanEdit(actor: User, part: Part): void {
  if (actor.id !== part.authorId && !isModerator(actor)) {
    throw AppError.forbidden('Only the author of this part or a moderator can change it.');
  }
  if (part.status === 'rejected') throw AppError.conflict('This part was rejected; that decision is final. Submit a new part instead.');
  if (part.status === 'retired') throw AppError.conflict('This part has been retired from the shelf and can no longer be changed.');
}
