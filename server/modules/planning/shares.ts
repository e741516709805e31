// Who a kit is shared with: members (by address or id, read or edit) and crews the owner is in.
import type { KitCrewShareList, KitShareList } from '@shared/api/planning';
import type { KitCrewSharesInput, KitSharesInput } from '@shared/schemas/planning';
import { Crew, CrewMember, KitCrewShare, KitShare, User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { findKit } from './access';
import { touchKit } from './kits';
import { presentCrewShares, presentShares } from './presenter';
import type { PlanningDeps } from './service';

export function shareService({ sequelize, alerts }: Pick<PlanningDeps, 'sequelize' | 'alerts'>) {
  return {
    /** Replaces who the kit is shared with. Owner only. */
    async setShares(viewer: User, kitId: number, input: KitSharesInput): Promise<KitShareList> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'owner', 'Only the kit’s owner can choose who it is shared with.', t);
        const fields: Record<string, string> = {};
        const resolved: { userId: number; access: 'read' | 'edit' }[] = [];
        for (const [i, share] of input.shares.entries()) {
          const key = `shares.${i}.${share.email !== undefined ? 'email' : 'userId'}`;
          const user =
            share.email !== undefined
              ? await User.findOne({ where: { email: share.email }, transaction: t })
              : await User.findByPk(share.userId!, { transaction: t });
          // an unknown and a suspended account get the same words, and neither is named
          if (!user || user.status !== 'active') {
            fields[key] =
              share.email !== undefined
                ? `The kit cannot be shared with ${share.email}. Check the spelling, or ask them for the address they sign in with.`
                : `The kit cannot be shared with member ${share.userId}. Pick the member again, or share by the address they sign in with.`;
          } else if (user.id === kit.ownerId) {
            fields[key] = 'That is you: you own this kit already.';
          } else if (resolved.some((r) => r.userId === user.id)) {
            fields[key] = `${user.displayName} is on the list twice; keep one entry.`;
          } else {
            resolved.push({ userId: user.id, access: share.access });
          }
        }
        const problems = Object.values(fields);
        if (problems.length) {
          throw AppError.fields(problems.length === 1 ? problems[0] : 'Some of these members cannot be added; see each entry.', fields);
        }
        const before = new Set((await KitShare.findAll({ where: { kitId: kit.id }, attributes: ['userId'], transaction: t })).map((s) => s.userId));
        await KitShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitShare.bulkCreate(
          resolved.map((r) => ({ kitId: kit.id, ...r })),
          { transaction: t },
        );
        await touchKit(kit, t);
        const added = resolved.filter((r) => !before.has(r.userId));
        for (const r of added) {
          await alerts?.send(
            [r.userId],
            'kit_shared',
            {
              title: `A shoot kit was shared with you: ${kit.name}`,
              body: `${viewer.displayName} shared the kit “${kit.name}” with you${r.access === 'edit' ? ' and lets you change it' : ' to read'}.`,
              link: `/kits/${kit.id}`,
              mail: {
                subject: `${viewer.displayName} shared a shoot kit with you: ${kit.name}`,
                heading: 'A shoot kit is shared with you',
                actionLabel: 'Open the kit',
              },
            },
            t,
            viewer.id,
          );
        }
      });
      const shares = await KitShare.findAll({ where: { kitId }, include: [{ model: User, as: 'user' }] });
      return { shares: presentShares(shares, 'owner') };
    },

    /** Replaces the crews the kit is shared with. Owner only, and only with crews the owner is in. */
    async setCrewShares(viewer: User, kitId: number, input: KitCrewSharesInput): Promise<KitCrewShareList> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'owner', 'Only the kit’s owner can choose which crews it is shared with.', t);
        const fields: Record<string, string> = {};
        const seen = new Set<number>();
        for (const [i, share] of input.crewShares.entries()) {
          if (seen.has(share.crewId)) fields[`crewShares.${i}.crewId`] = 'That crew is on the list twice; keep one entry.';
          else if (!(await CrewMember.count({ where: { crewId: share.crewId, userId: viewer.id }, transaction: t }))) {
            fields[`crewShares.${i}.crewId`] = 'You can share a kit only with a crew you are in.';
          }
          seen.add(share.crewId);
        }
        const problems = Object.values(fields);
        if (problems.length) throw AppError.fields(problems.length === 1 ? problems[0] : 'Some of these crews cannot be added; see each entry.', fields);
        await KitCrewShare.destroy({ where: { kitId: kit.id }, transaction: t });
        await KitCrewShare.bulkCreate(
          input.crewShares.map((s) => ({ kitId: kit.id, crewId: s.crewId, access: s.access })),
          { transaction: t },
        );
        await touchKit(kit, t);
      });
      const rows = await KitCrewShare.findAll({ where: { kitId }, include: [{ model: Crew, as: 'crew' }], order: [['id', 'ASC']] });
      return { crewShares: presentCrewShares(rows) };
    },
  };
}
