// Crews and their members. Leads manage members and invitations; any member may leave, except the
// last lead. Members see their crew; moderators and admins may look at any crew; everyone else is
// told it does not exist (404).
import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { CrewInfo, CrewInvitationInfo, CrewSummary, InvitationPreview, InvitationStatus } from '@shared/api/crews';
import { INVITATION_LIFETIME_DAYS, MAX_CREW_MEMBERS, type CrewInput, type CrewInvitationInput, type CrewPatch, type CrewRole } from '@shared/schemas/crews';
import { Crew, CrewInvitation, CrewMember, KitCrewShare, Part, User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { hashToken, newToken } from '../auth/tokens';
import type { Mailer } from '../mail/outbox';
import { mailTemplates } from '../mail/templates';

export const crewNotFound = () => AppError.notFound('There is no crew with that id among yours.');

function isModerator(user: User | undefined | null): boolean {
  return !!user && (user.role === 'moderator' || user.role === 'admin');
}

/** The member's row in a crew, or null. */
export async function membershipOf(userId: number, crewId: number, transaction?: Transaction): Promise<CrewMember | null> {
  return CrewMember.findOne({ where: { userId, crewId }, transaction });
}

/** Every crew the user belongs to, with their crew role. */
export async function crewsOf(userId: number, transaction?: Transaction): Promise<{ crewId: number; role: CrewRole }[]> {
  const rows = await CrewMember.findAll({ where: { userId }, attributes: ['crewId', 'role'], order: [['crewId', 'ASC']], transaction });
  return rows.map((r) => ({ crewId: r.crewId, role: r.role }));
}

/** Ids of the crews the user belongs to (none for a visitor). */
export async function crewIdsOf(user: User | undefined | null, transaction?: Transaction): Promise<number[]> {
  if (!user) return [];
  return (await crewsOf(user.id, transaction)).map((c) => c.crewId);
}

function invitationStatus(inv: CrewInvitation, now = Date.now()): InvitationStatus {
  if (inv.acceptedAt) return 'accepted';
  if (inv.withdrawnAt) return 'withdrawn';
  return inv.expiresAt.getTime() <= now ? 'expired' : 'waiting';
}

function presentInvitation(inv: CrewInvitation): CrewInvitationInfo {
  return {
    id: inv.id,
    email: inv.email,
    role: inv.role,
    status: invitationStatus(inv),
    invitedBy: inv.inviter?.displayName ?? null,
    expiresAt: inv.expiresAt.toISOString(),
    createdAt: inv.createdAt.toISOString(),
  };
}

function summary(crew: Crew, myRole: CrewRole | null, memberCount: number): CrewSummary {
  return {
    id: crew.id,
    name: crew.name,
    production: crew.production,
    currency: crew.currency,
    taxRatePct: crew.taxRatePct,
    myRole,
    memberCount,
  };
}

export interface CrewsDeps {
  sequelize: Sequelize;
  mail: Mailer;
  publicUrl: string;
}

export function createCrewsService({ sequelize, mail, publicUrl }: CrewsDeps) {
  /** The crew and the viewer's role in it; 404 for someone who is neither in it nor a moderator. */
  async function find(viewer: User, crewId: number, transaction?: Transaction) {
    const crew = await Crew.findByPk(crewId, { transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
    if (!crew) throw crewNotFound();
    const membership = await membershipOf(viewer.id, crew.id, transaction);
    if (!membership && !isModerator(viewer)) throw crewNotFound();
    return { crew, role: membership?.role ?? null };
  }

  async function findAsLead(viewer: User, crewId: number, transaction?: Transaction, refusal = 'Only a lead of this crew can do that.') {
    const found = await find(viewer, crewId, transaction);
    if (found.role !== 'lead') throw AppError.forbidden(refusal);
    return found;
  }

  async function leadCount(crewId: number, transaction?: Transaction) {
    return CrewMember.count({ where: { crewId, role: 'lead' }, transaction });
  }

  const service = {
    membershipOf,
    crewsOf,
    crewIdsOf,

    async list(viewer: User): Promise<CrewSummary[]> {
      const mine = await CrewMember.findAll({ where: { userId: viewer.id }, include: [{ model: Crew, as: 'crew' }] });
      if (!mine.length) return [];
      const counts = await CrewMember.count({ where: { crewId: { [Op.in]: mine.map((m) => m.crewId) } }, group: ['crewId'] });
      const countOf = new Map((counts as unknown as { crewId: number; count: number }[]).map((c) => [c.crewId, Number(c.count)]));
      return mine.map((m) => summary(m.crew!, m.role, countOf.get(m.crewId) ?? 1)).sort((a, b) => a.name.localeCompare(b.name) || a.id - b.id);
    },

    async get(viewer: User, crewId: number): Promise<CrewInfo> {
      const { crew, role } = await find(viewer, crewId);
      const members = await CrewMember.findAll({
        where: { crewId },
        include: [{ model: User, as: 'user', attributes: ['id', 'displayName'] }],
        order: [
          ['createdAt', 'ASC'],
          ['id', 'ASC'],
        ],
      });
      const seesInvitations = role === 'lead' || isModerator(viewer);
      const invitations = seesInvitations
        ? await CrewInvitation.findAll({
            where: { crewId },
            include: [{ model: User, as: 'inviter', attributes: ['id', 'displayName'] }],
            order: [
              ['createdAt', 'DESC'],
              ['id', 'DESC'],
            ],
            limit: 100,
          })
        : [];
      const partCount = await Part.count({ where: { crewId, status: { [Op.in]: ['published', 'in_review', 'sent_back'] } } });
      return {
        ...summary(crew, role, members.length),
        members: members
          .map((m) => ({ userId: m.userId, displayName: m.user!.displayName, role: m.role, joinedAt: m.createdAt.toISOString() }))
          .sort((a, b) => (a.role === b.role ? 0 : a.role === 'lead' ? -1 : 1)),
        invitations: invitations.map(presentInvitation),
        partCount,
      };
    },

    async create(viewer: User, input: CrewInput): Promise<CrewInfo> {
      const crew = await transact(sequelize, async (t) => {
        const made = await Crew.create(
          { name: input.name, production: input.production, currency: input.currency, taxRatePct: input.taxRatePct, createdBy: viewer.id },
          { transaction: t },
        );
        await CrewMember.create({ crewId: made.id, userId: viewer.id, role: 'lead' }, { transaction: t });
        return made;
      });
      return service.get(viewer, crew.id);
    },

    async update(viewer: User, crewId: number, patch: CrewPatch): Promise<CrewInfo> {
      await transact(sequelize, async (t) => {
        const { crew } = await findAsLead(viewer, crewId, t, 'Only a lead of this crew can change its name, production, currency or tax rate.');
        const values: Partial<Pick<Crew, 'name' | 'production' | 'currency' | 'taxRatePct'>> = {};
        if (patch.name !== undefined) values.name = patch.name;
        if (patch.production !== undefined) values.production = patch.production;
        if (patch.currency !== undefined) values.currency = patch.currency;
        if (patch.taxRatePct !== undefined) values.taxRatePct = patch.taxRatePct;
        await crew.update(values, { transaction: t });
      });
      return service.get(viewer, crewId);
    },

    async remove(viewer: User, crewId: number): Promise<void> {
      await transact(sequelize, async (t) => {
        const { crew } = await findAsLead(viewer, crewId, t, 'Only a lead of this crew can delete it.');
        const parts = await Part.count({ where: { crewId }, transaction: t });
        if (parts) {
          throw AppError.conflict(
            `${parts === 1 ? 'One part is' : `${parts} parts are`} published to this crew only. Their authors must publish them to everyone or retire them before the crew can be deleted.`,
          );
        }
        await KitCrewShare.destroy({ where: { crewId }, transaction: t });
        await CrewInvitation.destroy({ where: { crewId }, transaction: t });
        await CrewMember.destroy({ where: { crewId }, transaction: t });
        await crew.destroy({ transaction: t });
      });
    },

    async invite(viewer: User, crewId: number, input: CrewInvitationInput): Promise<CrewInvitationInfo> {
      const made = newToken();
      const invitation = await transact(sequelize, async (t) => {
        const { crew } = await findAsLead(viewer, crewId, t, 'Only a lead of this crew can invite people.');
        const existing = await User.findOne({ where: { email: input.email }, transaction: t });
        if (existing && (await membershipOf(existing.id, crewId, t))) {
          throw AppError.conflict(`${existing.displayName} is already in this crew. Change their crew role in the member list instead.`);
        }
        if ((await CrewMember.count({ where: { crewId }, transaction: t })) >= MAX_CREW_MEMBERS) {
          throw AppError.conflict(`A crew has at most ${MAX_CREW_MEMBERS} members.`);
        }
        // a new invitation replaces the waiting one for the same address, so only the newest link works
        await CrewInvitation.update(
          { withdrawnAt: new Date() },
          { where: { crewId, email: input.email, acceptedAt: null, withdrawnAt: null }, transaction: t },
        );
        const expiresAt = new Date(Date.now() + INVITATION_LIFETIME_DAYS * 86_400_000);
        const row = await CrewInvitation.create(
          {
            crewId,
            email: input.email,
            role: input.role,
            tokenHash: made.hash,
            invitedBy: viewer.id,
            expiresAt,
            acceptedAt: null,
            acceptedBy: null,
            withdrawnAt: null,
          },
          { transaction: t },
        );
        await mail.enqueue(
          input.email,
          mailTemplates.crewInvitation({
            crewName: crew.name,
            production: crew.production,
            invitedBy: viewer.displayName,
            role: input.role,
            link: `${publicUrl}/invitations/${made.token}`,
            expiresDays: INVITATION_LIFETIME_DAYS,
          }),
          t,
        );
        return row;
      });
      const row = await CrewInvitation.findByPk(invitation.id, { include: [{ model: User, as: 'inviter', attributes: ['id', 'displayName'] }] });
      return presentInvitation(row!);
    },

    async withdrawInvitation(viewer: User, crewId: number, invitationId: number): Promise<void> {
      await transact(sequelize, async (t) => {
        await findAsLead(viewer, crewId, t, 'Only a lead of this crew can withdraw invitations.');
        const inv = await CrewInvitation.findOne({ where: { id: invitationId, crewId }, transaction: t });
        if (!inv) throw AppError.notFound('There is no invitation with that id in this crew.');
        if (inv.acceptedAt) throw AppError.conflict('This invitation was already accepted; remove the member from the list instead.');
        if (!inv.withdrawnAt) await inv.update({ withdrawnAt: new Date() }, { transaction: t });
      });
    },

    /** The waiting invitation behind a link, or a 400 a person can act on. */
    async findInvitation(token: string, transaction?: Transaction): Promise<CrewInvitation> {
      const inv = await CrewInvitation.findOne({
        where: { tokenHash: hashToken(token) },
        include: [
          { model: Crew, as: 'crew' },
          { model: User, as: 'inviter', attributes: ['id', 'displayName'] },
        ],
        transaction,
        ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
      });
      const bad = (code: string, message: string) => new AppError(400, code, message);
      if (!inv)
        throw bad(
          'invitation_invalid',
          'This invitation link is not valid. Open the whole link from the newest mail, or ask the crew’s lead to invite you again.',
        );
      const status = invitationStatus(inv);
      if (status === 'accepted') throw bad('invitation_used', 'This invitation was already accepted. Open Crews to find the crew.');
      if (status === 'withdrawn')
        throw bad(
          'invitation_withdrawn',
          'This invitation was withdrawn or replaced by a newer one. Use the newest mail, or ask the crew’s lead to invite you again.',
        );
      if (status === 'expired') throw bad('invitation_expired', 'This invitation has expired. Ask the crew’s lead to invite you again.');
      return inv;
    },

    async previewInvitation(token: string): Promise<InvitationPreview> {
      const inv = await service.findInvitation(token);
      return {
        crewName: inv.crew!.name,
        production: inv.crew!.production,
        role: inv.role,
        email: inv.email,
        invitedBy: inv.inviter?.displayName ?? null,
        expiresAt: inv.expiresAt.toISOString(),
      };
    },

    async accept(viewer: User, token: string): Promise<CrewInfo> {
      const crewId = await transact(sequelize, async (t) => {
        const inv = await service.findInvitation(token, t);
        if (inv.email.toLowerCase() !== viewer.email.toLowerCase()) {
          throw AppError.forbidden(
            `This invitation was sent to another e-mail address. Sign in with the account for ${inv.email}, or ask the crew’s lead to invite ${viewer.email}.`,
          );
        }
        const already = await membershipOf(viewer.id, inv.crewId, t);
        if (!already) await CrewMember.create({ crewId: inv.crewId, userId: viewer.id, role: inv.role }, { transaction: t });
        await inv.update({ acceptedAt: new Date(), acceptedBy: viewer.id }, { transaction: t });
        return inv.crewId;
      });
      return service.get(viewer, crewId);
    },

    async setMemberRole(viewer: User, crewId: number, userId: number, role: CrewRole): Promise<CrewInfo> {
      await transact(sequelize, async (t) => {
        await findAsLead(viewer, crewId, t, 'Only a lead of this crew can change crew roles.');
        const member = await membershipOf(userId, crewId, t);
        if (!member) throw AppError.notFound('That person is not in this crew.');
        if (member.role === 'lead' && role !== 'lead' && (await leadCount(crewId, t)) <= 1) {
          throw AppError.conflict('A crew needs at least one lead. Make another member a lead first.');
        }
        if (member.role !== role) await member.update({ role }, { transaction: t });
      });
      return service.get(viewer, crewId);
    },

    /** A lead removes a member, or a member leaves (userId = their own). */
    async removeMember(viewer: User, crewId: number, userId: number): Promise<void> {
      await transact(sequelize, async (t) => {
        const { role } = await find(viewer, crewId, t);
        const self = userId === viewer.id;
        if (!self && role !== 'lead') throw AppError.forbidden('Only a lead of this crew can remove members. You can leave the crew yourself.');
        const member = await membershipOf(userId, crewId, t);
        if (!member) throw AppError.notFound('That person is not in this crew.');
        if (member.role === 'lead' && (await leadCount(crewId, t)) <= 1) {
          throw AppError.conflict(
            self
              ? 'You are the crew’s only lead, so you cannot leave. Make another member a lead first, or delete the crew.'
              : 'A crew needs at least one lead. Make another member a lead first.',
          );
        }
        await member.destroy({ transaction: t });
      });
    },
  };
  return service;
}

export type CrewsService = ReturnType<typeof createCrewsService>;
