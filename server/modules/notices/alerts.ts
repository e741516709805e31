// Notices a contributor asked to hear about: the bell and a mail through the outbox, each left out
// when the member switched that kind off. Always called inside the transaction of the event itself,
// so a rolled-back event leaves neither a notice nor a mail behind.
import type { Transaction } from 'sequelize';
import { ALERT_KINDS, type AlertKind, type NoticePreferenceInfo, type NoticePreferencesInput } from '@shared/schemas/notices';
import { NoticePreference, Part, PartRevision, User } from '../../db/models';
import { memberAlertMail } from '../mail/templates';
import type { MailQueue } from '../review/service';
import { notices } from './service';

export interface AlertContent {
  title: string;
  body: string;
  /** A path inside the app, e.g. /parts/slug. */
  link: string;
  mail: { subject: string; heading: string; actionLabel: string; note?: { label: string; text: string } | null };
}

export interface AlertDeps {
  mail: MailQueue;
  publicUrl: string;
}

export function createAlerts({ mail, publicUrl }: AlertDeps) {
  async function wanted(userId: number, kind: AlertKind, transaction?: Transaction) {
    const row = await NoticePreference.findOne({ where: { userId, kind }, transaction });
    return { bell: row?.bell ?? true, mail: row?.mail ?? true };
  }

  return {
    /** Tells each member (once, never the actor) about `kind`, as far as their settings allow. */
    async send(userIds: number[], kind: AlertKind, content: AlertContent, t: Transaction, actorId?: number) {
      for (const userId of new Set(userIds)) {
        if (userId === actorId) continue;
        const want = await wanted(userId, kind, t);
        if (want.bell) await notices.notify([userId], { kind, title: content.title, body: content.body, link: content.link }, t);
        if (!want.mail) continue;
        const user = await User.findByPk(userId, { attributes: ['id', 'email', 'status'], transaction: t });
        if (!user || user.status !== 'active') continue;
        await mail.enqueue(
          user.email,
          memberAlertMail({ ...content.mail, text: content.body, link: `${publicUrl}${content.link}`, settingsLink: `${publicUrl}/account#notices` }),
          t,
        );
      }
    },

    async preferences(userId: number): Promise<NoticePreferenceInfo[]> {
      const rows = await NoticePreference.findAll({ where: { userId } });
      return ALERT_KINDS.map(({ key, label }) => {
        const row = rows.find((r) => r.kind === key);
        return { kind: key, label, bell: row?.bell ?? true, mail: row?.mail ?? true };
      });
    },

    async setPreferences(userId: number, input: NoticePreferencesInput): Promise<NoticePreferenceInfo[]> {
      // one row per kind, replaced whole: upsert keeps a second tab's save from failing on the key
      for (const p of input.preferences) await NoticePreference.upsert({ userId, kind: p.kind, bell: p.bell, mail: p.mail });
      return this.preferences(userId);
    },
  };
}

export type Alerts = ReturnType<typeof createAlerts>;

/** The first approval of an adaptation tells the parent's author (inside the approving transaction). */
export async function tellParentAuthor(alerts: Alerts, part: Part, previousRevisionId: number | null, t: Transaction): Promise<void> {
  if (!part.parentId || previousRevisionId || !part.publishedRevisionId) return;
  const parent = await Part.findByPk(part.parentId, { attributes: ['id', 'slug', 'authorId', 'publishedRevisionId', 'latestRevisionId'], transaction: t });
  if (!parent || parent.authorId === part.authorId) return;
  const [rev, parentRev, author] = await Promise.all([
    PartRevision.findByPk(part.publishedRevisionId, { attributes: ['title', 'licence'], transaction: t }),
    PartRevision.findByPk(parent.publishedRevisionId ?? parent.latestRevisionId!, { attributes: ['title'], transaction: t }),
    User.findByPk(part.authorId, { attributes: ['displayName'], transaction: t }),
  ]);
  const title = rev?.title ?? part.slug;
  const parentTitle = parentRev?.title ?? parent.slug;
  const who = author?.displayName ?? 'A crew member';
  await alerts.send(
    [parent.authorId],
    'adapted',
    {
      title: `Your part was adapted: ${parentTitle}`,
      body: `${who} adapted “${parentTitle}” as “${title}”${rev?.licence ? ` (${rev.licence})` : ''}; it is on the shelf now.`,
      link: `/parts/${part.slug}`,
      mail: { subject: `${who} adapted your part ${parentTitle}`, heading: 'Someone built on your part', actionLabel: 'See the adaptation' },
    },
    t,
    part.authorId,
  );
}
