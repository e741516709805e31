import { describe, expect, it } from 'vitest';
import { mailTemplates, type MailContent } from '../../server/modules/mail/templates';

const HOSTILE = '<img src=x onerror=alert(1)>';
const ESCAPED = '&lt;img src=x onerror=alert(1)&gt;';
const LINK = 'https://shelf.example.org/parts/cheese-plate?x=1&y=2';

const all: Record<string, MailContent> = {
  newSubmission: mailTemplates.newSubmission({ partTitle: HOSTILE, contributor: HOSTILE, link: LINK, isRevision: false }),
  newRevision: mailTemplates.newSubmission({ partTitle: HOSTILE, contributor: HOSTILE, link: LINK, isRevision: true }),
  approved: mailTemplates.decision({ partTitle: HOSTILE, decision: 'approved', note: HOSTILE, moderator: HOSTILE, link: LINK }),
  sentBack: mailTemplates.decision({ partTitle: HOSTILE, decision: 'sent_back', note: HOSTILE, moderator: HOSTILE, link: LINK }),
  rejected: mailTemplates.decision({ partTitle: HOSTILE, decision: 'rejected', note: HOSTILE, moderator: HOSTILE, link: LINK }),
  retired: mailTemplates.decision({ partTitle: HOSTILE, decision: 'retired', note: HOSTILE, moderator: HOSTILE, link: LINK }),
  verifyEmail: mailTemplates.verifyEmail({ displayName: HOSTILE, link: LINK, expiresHours: 48 }),
  passwordReset: mailTemplates.passwordReset({ displayName: HOSTILE, link: LINK, expiresMinutes: 60 }),
  wantedAnswered: mailTemplates.wantedAnswered({
    requestTitle: HOSTILE,
    partTitle: HOSTILE,
    answeredBy: HOSTILE,
    note: HOSTILE,
    partLink: LINK,
    requestLink: LINK,
  }),
};

describe('mail templates · escaping', () => {
  for (const [name, mail] of Object.entries(all)) {
    it(`${name} · a hostile title, name or note · is escaped in the HTML and kept plain in the text`, () => {
      expect(mail.html).toContain(ESCAPED);
      expect(mail.html).not.toContain('<img');
      expect(mail.html).not.toMatch(/onerror=alert\(1\)>/);
      expect(mail.text).toContain(HOSTILE);
      expect(mail.text).not.toContain('&lt;');
    });

    it(`${name} · any mail · carries the link in both parts, the & escaped in HTML attributes`, () => {
      expect(mail.text).toContain(LINK);
      expect(mail.html).toContain('href="https://shelf.example.org/parts/cheese-plate?x=1&amp;y=2"');
    });

    it(`${name} · layout · uses our palette inline and loads nothing from outside`, () => {
      expect(mail.html).toContain('#163733');
      expect(mail.html).toContain('#f2a524');
      expect(mail.html).not.toMatch(/<img|<link|<script|@import|url\(/i);
      expect(mail.subject).not.toMatch(/[\r\n]/);
    });
  }

  it('subject · a title with line breaks and a header after them · stays one header line', () => {
    const mail = mailTemplates.decision({
      partTitle: 'Rod clamp\r\nBcc: someone@example.org',
      decision: 'approved',
      note: null,
      moderator: 'Dario',
      link: LINK,
    });
    expect(mail.subject).toBe('On the shelf: Rod clamp Bcc: someone@example.org');
  });

  it('quotes · an ampersand in a name · is escaped once, not twice', () => {
    const mail = mailTemplates.verifyEmail({ displayName: 'Grip & Electric', link: LINK, expiresHours: 48 });
    expect(mail.html).toContain('Grip &amp; Electric');
    expect(mail.html).not.toContain('&amp;amp;');
    expect(mail.text).toContain('Hi Grip & Electric,');
  });
});

describe('mail templates · wording', () => {
  const decision = (d: 'approved' | 'sent_back' | 'rejected' | 'retired', note: string | null = 'Widen the slot to 6.5 mm.') =>
    mailTemplates.decision({ partTitle: 'Monitor cheese plate', decision: d, note, moderator: 'Dario Quillfeather', link: LINK });

  it('decision · approved · says the part is on the shelf', () => {
    const mail = decision('approved', null);
    expect(mail.subject).toContain('Monitor cheese plate');
    expect(mail.text).toMatch(/on the shelf/i);
    expect(mail.html).toMatch(/on the shelf/i);
  });

  it('decision · sent back · includes the note and says what to do next', () => {
    const mail = decision('sent_back');
    expect(mail.text).toContain('Widen the slot to 6.5 mm.');
    expect(mail.html).toContain('Widen the slot to 6.5 mm.');
    expect(mail.text).toMatch(/What to do next: .*submit it for review again/);
  });

  it('decision · every outcome with a note · includes the note and names the moderator', () => {
    for (const d of ['approved', 'sent_back', 'rejected', 'retired'] as const) {
      const mail = decision(d);
      expect(mail.text).toContain('Widen the slot to 6.5 mm.');
      expect(mail.text).toContain('Dario Quillfeather');
    }
  });

  it('decision · a multi-line note · keeps its lines in both parts', () => {
    const mail = decision('sent_back', 'First line.\nSecond line.');
    expect(mail.text).toContain('  First line.\n  Second line.');
    expect(mail.html).toContain('First line.<br>Second line.');
  });

  it('decision · sent back without a note · says who to ask', () => {
    expect(decision('sent_back', null).text).toContain('No note was left. Ask Dario Quillfeather what to change.');
  });

  it('new submission · revision or new part · tells them apart in subject and text', () => {
    const fresh = mailTemplates.newSubmission({ partTitle: 'Cable clip', contributor: 'Wren', link: LINK, isRevision: false });
    const again = mailTemplates.newSubmission({ partTitle: 'Cable clip', contributor: 'Wren', link: LINK, isRevision: true });
    expect(fresh.subject).toBe('New part to review: Cable clip');
    expect(again.subject).toBe('Revision to review: Cable clip');
    expect(again.text).toContain('Wren sent a new revision of “Cable clip”');
  });

  it('verification and reset · lifetimes · are stated in the mail', () => {
    expect(mailTemplates.verifyEmail({ displayName: 'Wren', link: LINK, expiresHours: 48 }).text).toContain('48 hours');
    expect(mailTemplates.passwordReset({ displayName: 'Wren', link: LINK, expiresMinutes: 60 }).text).toContain('60 minutes');
    expect(mailTemplates.verifyEmail({ displayName: 'Wren', link: LINK, expiresHours: 1 }).text).toContain('1 hour.');
  });
});
