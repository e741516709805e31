import { z } from 'zod';

/** The notices a member can switch off, each for the bell and for mail. */
export const ALERT_KINDS = [
  { key: 'report_trouble', label: 'A set report on your part says it deformed, cracked or failed' },
  { key: 'adapted', label: 'Someone adapts one of your parts' },
  { key: 'kit_shared', label: 'A shoot kit is shared with you' },
  { key: 'wanted_closed', label: 'A wanted request you answered is closed' },
] as const;
export type AlertKind = (typeof ALERT_KINDS)[number]['key'];
export const ALERT_KIND_KEYS = ALERT_KINDS.map((k) => k.key) as [AlertKind, ...AlertKind[]];

export const noticePreferenceSchema = z.object({
  kind: z.enum(ALERT_KIND_KEYS, { error: 'Pick one of the kinds of notice listed.' }),
  bell: z.boolean({ error: 'Say whether the bell shows this kind (true or false).' }),
  mail: z.boolean({ error: 'Say whether mail is sent for this kind (true or false).' }),
});
export type NoticePreferenceInput = z.infer<typeof noticePreferenceSchema>;

export const noticePreferencesSchema = z.object({
  preferences: z
    .array(noticePreferenceSchema)
    .min(1, 'Send at least one kind of notice.')
    .max(ALERT_KINDS.length * 2),
});
export type NoticePreferencesInput = z.infer<typeof noticePreferencesSchema>;

export interface NoticePreferenceInfo {
  kind: AlertKind;
  label: string;
  bell: boolean;
  mail: boolean;
}

/**
 * The key a client sends with a write it may repeat (a set report or rating queued offline), in the
 * `Idempotency-Key` header: the first request files it, a repeat gets the first answer back.
 */
export const clientKeySchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9_-]{8,64}$/, 'The Idempotency-Key header takes 8 to 64 letters, digits, "-" or "_" (a UUID will do).');

export const recallParamsSchema = z.object({
  id: z.coerce.number({ error: 'Give the kit’s number.' }).int().positive('Give the kit’s number.'),
  recallId: z.coerce.number({ error: 'Give the recall’s number.' }).int().positive('Give the recall’s number.'),
});

export interface KitRecallInfo {
  id: number;
  partId: number;
  partTitle: string;
  partLink: string;
  kind: 'retired' | 'cautions' | 'reports';
  reason: string;
  createdAt: string;
}
