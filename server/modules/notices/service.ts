import { Op, type Transaction } from 'sequelize';
import { Notice } from '../../db/models';
import { AppError } from '../../errors';

export interface NoticeContent {
  kind: string;
  title: string;
  body: string;
  link?: string | null;
}

export const notices = {
  async notify(userIds: number[], content: NoticeContent, transaction?: Transaction): Promise<void> {
    if (!userIds.length) return;
    await Notice.bulkCreate(
      [...new Set(userIds)].map((userId) => ({ userId, ...content, link: content.link ?? null, readAt: null })),
      { transaction },
    );
  },

  async list(userId: number) {
    const [items, unread] = await Promise.all([
      Notice.findAll({
        where: { userId },
        order: [
          ['createdAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: 50,
      }),
      Notice.count({ where: { userId, readAt: null } }),
    ]);
    return { items: items.map((n) => n.toInfo()), unread };
  },

  async markRead(userId: number, id: number): Promise<void> {
    const [count] = await Notice.update({ readAt: new Date() }, { where: { id, userId, readAt: { [Op.is]: null } } });
    if (!count && !(await Notice.count({ where: { id, userId } }))) throw AppError.notFound('There is no such notice.');
  },

  async markAllRead(userId: number): Promise<void> {
    await Notice.update({ readAt: new Date() }, { where: { userId, readAt: { [Op.is]: null } } });
  },
};
