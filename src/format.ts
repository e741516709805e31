// How the client writes numbers, sizes and statuses. Lengths are millimetres first, inches after.
import type { PartStatus, RevisionStatus } from '@shared/types';
import { mmToInches } from '@shared/units';

type Size = readonly [number, number, number];

/** 20 → "20", 12.7 → "12.7", 0.254 → "0.25": one decimal, two below 1 mm. */
export function formatMm(mm: number): string {
  const digits = Math.abs(mm) < 1 && mm !== 0 ? 2 : 1;
  return String(Number(mm.toFixed(digits)));
}

export function formatInches(mm: number): string {
  return mmToInches(mm).toFixed(2);
}

/** "20 × 30 × 10 mm" */
export function formatSizeMm(size: Size): string {
  return `${size.map(formatMm).join(' × ')} mm`;
}

/** "0.79 × 1.18 × 0.39 in" */
export function formatSizeIn(size: Size): string {
  return `${size.map(formatInches).join(' × ')} in`;
}

/** 6000 mm³ → "6.0 cm³ (0.37 in³)" */
export function formatVolume(mm3: number): string {
  const cm3 = mm3 / 1000;
  const in3 = mm3 / 16387.064; // 25.4³, exact
  return `${cm3 < 10 ? cm3.toFixed(1) : Math.round(cm3).toLocaleString('en-US')} cm³ (${in3 < 10 ? in3.toFixed(2) : in3.toFixed(1)} in³)`;
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(0)} KB`;
  return `${Number((bytes / 1024 / 1024).toFixed(1))} MB`;
}

export function formatCount(n: number): string {
  return n.toLocaleString('en-US');
}

export function formatDate(iso: string): string {
  return new Date(iso).toLocaleDateString(undefined, { year: 'numeric', month: 'short', day: 'numeric' });
}

export interface StatusWording {
  label: string;
  icon: string;
  /** Class suffix for PartStatusTag's colours. */
  tone: 'shelf' | 'desk' | 'back' | 'no' | 'off';
}

export const STATUS_WORDING: Record<PartStatus | RevisionStatus, StatusWording> = {
  draft: { label: 'Not sent yet', icon: 'pi pi-pencil', tone: 'off' },
  in_review: { label: 'At the review desk', icon: 'pi pi-clock', tone: 'desk' },
  published: { label: 'On the shelf', icon: 'pi pi-check', tone: 'shelf' },
  sent_back: { label: 'Sent back for changes', icon: 'pi pi-replay', tone: 'back' },
  rejected: { label: 'Turned down', icon: 'pi pi-times', tone: 'no' },
  retired: { label: 'Taken off the shelf', icon: 'pi pi-inbox', tone: 'off' },
  superseded: { label: 'Replaced by a newer revision', icon: 'pi pi-history', tone: 'off' },
};
