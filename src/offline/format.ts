import { formatDate } from '@/lib/format';

/** "04:31 on 3 Dec 2026": when a stored copy was saved, in the device's time and the app's date style. */
export function formatAsOf(iso: string): string {
  const time = new Date(iso).toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit' });
  return `${time} on ${formatDate(iso)}`;
}
