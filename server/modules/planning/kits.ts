// Shoot kits themselves: the list (own and shared), one kit, its dates and conditions, deleting and leaving.
import { Op, type Transaction } from 'sequelize';
import type { KitDetail, KitList } from '@shared/api/planning';
import { MAX_KITS, type KitInput, type KitPatch } from '@shared/schemas/planning';
import { CrewMember, Kit, KitCrewShare, KitItem, KitShare, type User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { audienceOf } from '../parts/access';
import { findKit } from './access';
import { presentKit, presentKitList } from './presenter';
import type { PlanningDeps } from './service';
import { defined, textOrNull } from './values';

/** Marks the kit changed (its list is ordered by the last change) when only its items or shares changed. */
export async function touchKit(kit: Kit, transaction: Transaction) {
  kit.changed('updatedAt', true);
  await kit.save({ transaction });
}

function checkDates(startsOn: string | null, endsOn: string | null) {
  if (startsOn && endsOn && startsOn > endsOn) throw AppError.field('endsOn', 'The last shoot day cannot be before the first.');
}

export function kitService({ sequelize }: Pick<PlanningDeps, 'sequelize'>) {
  return {
    async listKits(viewer: User): Promise<KitList> {
      const shares = await KitShare.findAll({ where: { userId: viewer.id } });
      const audience = await audienceOf(viewer);
      const myCrews = (await CrewMember.findAll({ where: { userId: viewer.id }, attributes: ['crewId'] })).map((m) => m.crewId);
      const crewShares = myCrews.length ? await KitCrewShare.findAll({ where: { crewId: { [Op.in]: myCrews } } }) : [];
      const accessOf = new Map<number, 'read' | 'edit'>();
      for (const s of [...shares, ...crewShares]) if (accessOf.get(s.kitId) !== 'edit') accessOf.set(s.kitId, s.access);
      const shared = [...accessOf.keys()];
      const kits = await Kit.findAll({
        where: shared.length ? { [Op.or]: [{ ownerId: viewer.id }, { id: { [Op.in]: shared } }] } : { ownerId: viewer.id },
        order: [
          ['updatedAt', 'DESC'],
          ['id', 'DESC'],
        ],
      });
      const items = await presentKitList(kits, (kit) => (kit.ownerId === viewer.id ? 'owner' : accessOf.get(kit.id)!), audience);
      return { items };
    },

    async getKit(viewer: User, id: number): Promise<KitDetail> {
      const { kit, access } = await findKit(viewer, id, 'read');
      return presentKit(kit, access, await audienceOf(viewer));
    },

    async createKit(owner: User, input: KitInput): Promise<KitDetail> {
      if ((await Kit.count({ where: { ownerId: owner.id } })) >= MAX_KITS) {
        throw AppError.conflict(`You have ${MAX_KITS} kits already; delete old ones first.`);
      }
      const kit = await Kit.create({
        ownerId: owner.id,
        name: input.name,
        production: textOrNull(input.production),
        startsOn: input.startsOn ?? null,
        endsOn: input.endsOn ?? null,
        locationNotes: textOrNull(input.locationNotes),
        heatExposure: input.heatExposure ?? null,
        printHoursPerDay: input.printHoursPerDay,
        printerPrice: input.printerPrice ?? null,
      });
      return presentKit(await kit.reload(), 'owner', await audienceOf(owner));
    },

    async updateKit(viewer: User, id: number, patch: KitPatch): Promise<KitDetail> {
      const result = await transact(sequelize, async (t) => {
        const { kit, access } = await findKit(viewer, id, 'edit', undefined, t);
        const startsOn = patch.startsOn !== undefined ? patch.startsOn : kit.startsOn;
        const endsOn = patch.endsOn !== undefined ? patch.endsOn : kit.endsOn;
        checkDates(startsOn, endsOn);
        await kit.update(
          defined({
            name: patch.name,
            production: patch.production === undefined ? undefined : textOrNull(patch.production),
            startsOn: patch.startsOn,
            endsOn: patch.endsOn,
            locationNotes: patch.locationNotes === undefined ? undefined : textOrNull(patch.locationNotes),
            heatExposure: patch.heatExposure,
            printHoursPerDay: patch.printHoursPerDay,
            printerPrice: patch.printerPrice,
          }),
          { transaction: t },
        );
        return { kit, access };
      });
      return presentKit(await result.kit.reload(), result.access, await audienceOf(viewer));
    },

    async deleteKit(viewer: User, id: number): Promise<void> {
      const { kit } = await findKit(viewer, id, 'owner', 'Only the kit’s owner can delete it.');
      await transact(sequelize, async (t) => {
        await KitItem.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await kit.destroy({ transaction: t });
      });
    },

    /** A member the kit is shared with takes themselves off it; the owner keeps it. */
    async leave(viewer: User, kitId: number): Promise<void> {
      const { kit } = await findKit(viewer, kitId, 'read');
      if (kit.ownerId === viewer.id) throw AppError.conflict('You own this kit: delete it, or share it and keep it.');
      await KitShare.destroy({ where: { kitId: kit.id, userId: viewer.id } });
    },
  };
}
