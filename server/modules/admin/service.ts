import { Op } from 'sequelize';
import type { AdminUserPatch } from '@shared/schemas/auth';
import { Session, User } from '../../db/models';
import { AppError } from '../../errors';

export const adminService = {
  async listUsers(): Promise<User[]> {
    return User.findAll({ order: [['createdAt', 'ASC']] });
  },

  async updateUser(actor: User, id: number, patch: AdminUserPatch): Promise<User> {
    if (actor.id === id) {
      throw AppError.conflict('You cannot change your own role or status. Ask another admin.');
    }
    const user = await User.findByPk(id);
    if (!user) throw AppError.notFound('There is no account with that id.');
    await user.update(patch);
    if (patch.status === 'suspended') {
      // a suspended account's open sessions end now, not when they expire
      await Session.destroy({ where: { userId: { [Op.eq]: id } } });
    }
    return user;
  },
};
