// The mails Rigshelf sends, each as plain text and HTML built from the same blocks. Values that come
// from people (titles, names, notes) stay as typed in the text part and are HTML-escaped in the HTML
// part: every piece of text is escaped as a whole, our own wording included, so nothing can slip in as
// markup. Inline styles only, no external images or fonts.
import escapeHtml from 'escape-html';

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

export type Decision = 'approved' | 'sent_back' | 'rejected' | 'retired';

type Block =
  | { kind: 'p'; text: string }
  | { kind: 'note'; label: string; text: string }
  | { kind: 'action'; label: string; link: string }
  | { kind: 'small'; text: string };

const PALETTE = {
  band: '#163733',
  rule: '#f2a524',
  page: '#f3f1ec',
  card: '#ffffff',
  ink: '#1e2624',
  muted: '#5a6663',
  line: '#e2ded4',
  noteBg: '#f7f4ec',
};

const FOOTER = 'Rigshelf, the crew’s shelf of vetted printable rigging parts. This mail was sent automatically.';

/** Subjects are header lines: no line breaks or control characters, however a title was typed. */
function oneLine(value: string): string {
  return value
    .replace(/[\u0000-\u001f\u007f]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
}

function plural(n: number, one: string, many: string) {
  return `${n} ${n === 1 ? one : many}`;
}

function renderText(heading: string, blocks: Block[]): string {
  const parts = [heading, ''];
  for (const b of blocks) {
    if (b.kind === 'p' || b.kind === 'small') parts.push(b.text, '');
    else if (b.kind === 'note') parts.push(`${b.label}:`, ...b.text.split(/\r?\n/).map((line) => `  ${line}`), '');
    else parts.push(`${b.label}:`, b.link, '');
  }
  parts.push('--', FOOTER, '');
  return parts.join('\n');
}

function html(text: string): string {
  return escapeHtml(text).replace(/\r?\n/g, '<br>');
}

function renderHtml(subject: string, heading: string, blocks: Block[]): string {
  const body = blocks
    .map((b) => {
      switch (b.kind) {
        case 'p':
          return `<p style="margin:0 0 16px 0;">${html(b.text)}</p>`;
        case 'small':
          return `<p style="margin:0 0 16px 0;font-size:13px;color:${PALETTE.muted};">${html(b.text)}</p>`;
        case 'note':
          return (
            `<div style="margin:0 0 16px 0;padding:12px 16px;background:${PALETTE.noteBg};border-left:4px solid ${PALETTE.rule};">` +
            `<div style="font-size:13px;font-weight:bold;color:${PALETTE.muted};margin:0 0 4px 0;">${html(b.label)}</div>` +
            `<div>${html(b.text)}</div></div>`
          );
        case 'action':
          return (
            `<p style="margin:8px 0 16px 0;"><a href="${escapeHtml(b.link)}" style="display:inline-block;padding:10px 18px;` +
            `background:${PALETTE.band};color:#ffffff;text-decoration:none;font-weight:bold;border-radius:4px;">${html(b.label)}</a></p>` +
            `<p style="margin:0 0 16px 0;font-size:13px;color:${PALETTE.muted};">If the button does not open, paste this address into your browser:<br>` +
            `<a href="${escapeHtml(b.link)}" style="color:${PALETTE.band};word-break:break-all;">${html(b.link)}</a></p>`
          );
      }
    })
    .join('\n');
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${html(subject)}</title></head>
<body style="margin:0;padding:0;background:${PALETTE.page};">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:${PALETTE.page};">
<tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;background:${PALETTE.card};font-family:Arial,Helvetica,sans-serif;font-size:15px;line-height:1.5;color:${PALETTE.ink};">
<tr><td style="background:${PALETTE.band};color:#ffffff;padding:16px 24px;font-size:18px;font-weight:bold;letter-spacing:0.03em;">Rigshelf</td></tr>
<tr><td style="background:${PALETTE.rule};height:4px;line-height:4px;font-size:0;">&nbsp;</td></tr>
<tr><td style="padding:24px;">
<h1 style="margin:0 0 16px 0;font-size:20px;line-height:1.3;color:${PALETTE.band};">${html(heading)}</h1>
${body}
</td></tr>
<tr><td style="padding:16px 24px;border-top:1px solid ${PALETTE.line};font-size:12px;color:${PALETTE.muted};">${html(FOOTER)}</td></tr>
</table>
</td></tr>
</table>
</body>
</html>
`;
}

function mail(subject: string, heading: string, blocks: Block[]): MailContent {
  const line = oneLine(subject);
  return { subject: line, text: renderText(heading, blocks), html: renderHtml(line, heading, blocks) };
}

function noteBlock(note: string | null, moderator: string, fallback: string): Block {
  const text = note?.trim();
  return text ? { kind: 'note', label: `Note from ${moderator}`, text } : { kind: 'p', text: fallback };
}

export interface MailTemplates {
  newSubmission(p: { partTitle: string; contributor: string; link: string; isRevision: boolean }): MailContent;
  decision(p: { partTitle: string; decision: Decision; note: string | null; moderator: string; link: string }): MailContent;
  verifyEmail(p: { displayName: string; link: string; expiresHours: number }): MailContent;
  passwordReset(p: { displayName: string; link: string; expiresMinutes: number }): MailContent;
  alreadyRegistered(p: { displayName: string; signInLink: string; resetLink: string }): MailContent;
  wantedAnswered(p: { requestTitle: string; partTitle: string; answeredBy: string; note: string | null; partLink: string; requestLink: string }): MailContent;
  crewInvitation(p: {
    crewName: string;
    production: string | null;
    invitedBy: string;
    role: 'lead' | 'member';
    link: string;
    expiresDays: number;
  }): MailContent;
  printRequestStep(p: { subject: string; heading: string; text: string; note: string | null; noteBy: string; link: string }): MailContent;
}

export const mailTemplates: MailTemplates = {
  /** To moderators: a part (or a new revision of one) waits for review. */
  newSubmission(p: { partTitle: string; contributor: string; link: string; isRevision: boolean }): MailContent {
    const title = `“${p.partTitle}”`;
    return p.isRevision
      ? mail(`Revision to review: ${p.partTitle}`, 'A revision is waiting for review', [
          {
            kind: 'p',
            text: `${p.contributor} sent a new revision of ${title}. Compare it with the version on the shelf, then approve it, send it back with notes, or reject it.`,
          },
          { kind: 'action', label: 'Review the revision', link: p.link },
          { kind: 'small', text: 'You get this because you moderate the shelf.' },
        ])
      : mail(`New part to review: ${p.partTitle}`, 'A new part is waiting for review', [
          {
            kind: 'p',
            text: `${p.contributor} submitted ${title}. Check the model, the photos and the print settings, then approve it, send it back with notes, or reject it.`,
          },
          { kind: 'action', label: 'Review the part', link: p.link },
          { kind: 'small', text: 'You get this because you moderate the shelf.' },
        ]);
  },

  /** To the contributor: what a moderator decided about their part, with the moderator's note. */
  decision(p: { partTitle: string; decision: Decision; note: string | null; moderator: string; link: string }): MailContent {
    const title = `“${p.partTitle}”`;
    switch (p.decision) {
      case 'approved':
        return mail(`On the shelf: ${p.partTitle}`, 'Your part is on the shelf', [
          {
            kind: 'p',
            text: `${p.moderator} approved ${title}. It is on the shelf now: crews can find it, print it and tell you how it held up.`,
          },
          ...(p.note?.trim() ? [noteBlock(p.note, p.moderator, '')] : []),
          { kind: 'action', label: 'See it on the shelf', link: p.link },
        ]);
      case 'sent_back':
        return mail(`Back to you with notes: ${p.partTitle}`, 'Your part came back with notes', [
          { kind: 'p', text: `${p.moderator} sent ${title} back to you before it goes on the shelf.` },
          noteBlock(p.note, p.moderator, `No note was left. Ask ${p.moderator} what to change.`),
          {
            kind: 'p',
            text: 'What to do next: open the part, make the changes the note asks for, and submit it for review again. Everything you already added stays as it is until you change it.',
          },
          { kind: 'action', label: 'Open the part and revise it', link: p.link },
        ]);
      case 'rejected':
        return mail(`Not accepted: ${p.partTitle}`, 'Your part was not accepted', [
          { kind: 'p', text: `${p.moderator} decided that ${title} will not go on the shelf.` },
          noteBlock(p.note, p.moderator, `No note was left. Ask ${p.moderator} for the reason.`),
          {
            kind: 'p',
            text: 'If you can fix what the note describes, you are welcome to submit the part again as a new entry.',
          },
          { kind: 'action', label: 'Open the part', link: p.link },
        ]);
      case 'retired':
        return mail(`Taken off the shelf: ${p.partTitle}`, 'Your part was taken off the shelf', [
          { kind: 'p', text: `${p.moderator} retired ${title}. Crews no longer find it on the shelf.` },
          noteBlock(p.note, p.moderator, `No note was left. Ask ${p.moderator} for the reason.`),
          { kind: 'p', text: 'If it should come back, send a revised version; it goes through review like any other.' },
          { kind: 'action', label: 'Open the part', link: p.link },
        ]);
    }
  },

  /** To a new account: confirm the address. */
  verifyEmail(p: { displayName: string; link: string; expiresHours: number }): MailContent {
    return mail('Confirm your e-mail address for Rigshelf', 'Confirm your e-mail address', [
      {
        kind: 'p',
        text: `Hi ${p.displayName}, confirm that this address is yours so review decisions and password resets reach you.`,
      },
      { kind: 'action', label: 'Confirm my address', link: p.link },
      {
        kind: 'small',
        text: `The link works for ${plural(p.expiresHours, 'hour', 'hours')}. If you did not make a Rigshelf account, ignore this mail and nothing happens.`,
      },
    ]);
  },

  /** To an account that asked for a password reset. */
  passwordReset(p: { displayName: string; link: string; expiresMinutes: number }): MailContent {
    return mail('Reset your Rigshelf password', 'Choose a new password', [
      {
        kind: 'p',
        text: `Hi ${p.displayName}, someone asked to reset the password of your Rigshelf account. If that was you, choose a new one here.`,
      },
      { kind: 'action', label: 'Choose a new password', link: p.link },
      {
        kind: 'small',
        text: `The link works once, for ${plural(p.expiresMinutes, 'minute', 'minutes')}. A new password signs you out on every device. If it was not you, ignore this mail: your password stays as it is.`,
      },
    ]);
  },

  /** To the owner of an address someone tried to sign up with again. */
  alreadyRegistered(p: { displayName: string; signInLink: string; resetLink: string }): MailContent {
    return mail('Someone tried to sign up with your address', 'You already have a Rigshelf account', [
      {
        kind: 'p',
        text: `Hi ${p.displayName}, someone tried to create a new Rigshelf account with this address. It already has an account, so nothing was changed.`,
      },
      { kind: 'action', label: 'Sign in', link: p.signInLink },
      { kind: 'p', text: 'If you have forgotten your password, ask for a reset link:' },
      { kind: 'action', label: 'Reset my password', link: p.resetLink },
      { kind: 'small', text: 'If it was not you, ignore this mail: your account and password stay as they are.' },
    ]);
  },

  /** To a crew member who asked for a part: a part linked in answer is on the shelf. */
  wantedAnswered(p: { requestTitle: string; partTitle: string; answeredBy: string; note: string | null; partLink: string; requestLink: string }): MailContent {
    return mail(`A part for your request: ${p.requestTitle}`, 'Someone found a part for you', [
      { kind: 'p', text: `${p.answeredBy} answered your request “${p.requestTitle}” with “${p.partTitle}”, which is on the shelf now.` },
      ...(p.note?.trim() ? [{ kind: 'note', label: `Note from ${p.answeredBy}`, text: p.note.trim() } as Block] : []),
      { kind: 'action', label: 'See the part', link: p.partLink },
      {
        kind: 'p',
        text: `Check that it fits your rig before the shoot. If it does what you needed, close your request as solved so the crew knows: ${p.requestLink}`,
      },
      { kind: 'small', text: 'You get this because you asked the crew for a part on Rigshelf.' },
    ]);
  },

  /** To an address a crew lead invited: join the crew on Rigshelf. */
  crewInvitation(p: {
    crewName: string;
    production: string | null;
    invitedBy: string;
    role: 'lead' | 'member';
    link: string;
    expiresDays: number;
  }): MailContent {
    const crew = p.production ? `“${p.crewName}” (${p.production})` : `“${p.crewName}”`;
    return mail(`Join ${p.crewName} on Rigshelf`, 'You are invited to a crew', [
      {
        kind: 'p',
        text: `${p.invitedBy} invited you to the crew ${crew} as ${p.role === 'lead' ? 'a lead, who manages its members' : 'a member'}. Crew members see the parts published to the crew only, plan kits together and print for each other.`,
      },
      { kind: 'action', label: 'Join the crew', link: p.link },
      {
        kind: 'small',
        text: `The link works once, for ${plural(p.expiresDays, 'day', 'days')}, and only for the Rigshelf account with this e-mail address: sign in (or sign up) with it first. If you do not know ${p.invitedBy}, ignore this mail and nothing happens.`,
      },
    ]);
  },

  /** To the other side of a print request: what just happened to it, with the note if one was left. */
  printRequestStep(p: { subject: string; heading: string; text: string; note: string | null; noteBy: string; link: string }): MailContent {
    return mail(p.subject, p.heading, [
      { kind: 'p', text: p.text },
      ...(p.note?.trim() ? [{ kind: 'note', label: `Note from ${p.noteBy}`, text: p.note.trim() } as Block] : []),
      { kind: 'action', label: 'Open the request', link: p.link },
      { kind: 'small', text: 'You get this because you asked a crew member for a print, or one asked you, on Rigshelf.' },
    ]);
  },
};

/**
 * The mail beside a member's notice (a troubling set report, an adaptation, a shared kit, a closed
 * wanted request): the notice's own words, a link, and where to switch this kind off.
 */
export function memberAlertMail(p: {
  subject: string;
  heading: string;
  text: string;
  note?: { label: string; text: string } | null;
  actionLabel: string;
  link: string;
  settingsLink: string;
}): MailContent {
  return mail(p.subject, p.heading, [
    { kind: 'p', text: p.text },
    ...(p.note?.text.trim() ? [{ kind: 'note', label: p.note.label, text: p.note.text.trim() } as Block] : []),
    { kind: 'action', label: p.actionLabel, link: p.link },
    { kind: 'small', text: `You can switch this kind of notice off, for mail or the bell, in your account settings: ${p.settingsLink}` },
  ]);
}
