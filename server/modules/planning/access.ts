// Who may see and change a shoot kit: its owner, and the members it is shared with ('read' looks,
// 'edit' changes the kit and its items). Everyone else is told it does not exist (404).
import { Op, type Transaction } from 'sequelize';
import type { KitAccess } from '@shared/api/planning';
import { CrewMember, Kit, KitCrewShare, KitShare, type User } from '../../db/models';
import { AppError } from '../../errors';

const notFound = () => AppError.notFound('There is no kit with that id among yours or those shared with you.');

const RANK: Record<KitAccess, number> = { read: 0, edit: 1, owner: 2 };

/** The best of the member's own share and the shares of the crews they are in. */
export async function accessTo(viewer: User, kit: Kit, transaction?: Transaction): Promise<KitAccess | null> {
  if (kit.ownerId === viewer.id) return 'owner';
  const share = await KitShare.findOne({ where: { kitId: kit.id, userId: viewer.id }, transaction });
  let best: KitAccess | null = share?.access ?? null;
  if (best === 'edit') return best;
  const crewIds = (await CrewMember.findAll({ where: { userId: viewer.id }, attributes: ['crewId'], transaction })).map((m) => m.crewId);
  if (crewIds.length) {
    const crewShares = await KitCrewShare.findAll({ where: { kitId: kit.id, crewId: { [Op.in]: crewIds } }, transaction });
    for (const s of crewShares) if (best === null || RANK[s.access] > RANK[best]) best = s.access;
  }
  return best;
}

/**
 * The kit, if the viewer may at least see it (else 404), and 403 with `refusal` when they may see
 * it but need more than they have.
 */
export async function findKit(
  viewer: User,
  id: number,
  need: KitAccess,
  refusal?: string,
  transaction?: Transaction,
): Promise<{ kit: Kit; access: KitAccess }> {
  const kit = await Kit.findByPk(id, { transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!kit) throw notFound();
  const access = await accessTo(viewer, kit, transaction);
  if (!access) throw notFound();
  if (RANK[access] < RANK[need]) {
    throw AppError.forbidden(
      refusal ?? (need === 'owner' ? 'Only the kit’s owner can do that.' : 'This kit is shared with you to read; ask its owner for edit access to change it.'),
    );
  }
  return { kit, access };
}
