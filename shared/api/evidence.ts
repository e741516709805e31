// What the evidence endpoints answer (ratings, set reports, the proven figure, flags, crew profiles),
// for the client. The server builds these in server/modules/evidence/service.ts;
// tests/unit/api-shapes-evidence.test.ts checks at compile time that the two stay in step.
import type { Evidence, SetCondition } from '../evidence';
import type { SetReportOutcome } from '../ranking';

export type { Evidence, EvidenceWarning, ProvenFigures, SetCondition } from '../evidence';
export type { SetReportOutcome } from '../ranking';

export interface EvidenceAuthorRef {
  id: number;
  displayName: string;
}

/** Evidence['rating']: mean and adjusted are null until the first rating. */
export type RatingSummary = Evidence['rating'];
export type StarLevel = keyof RatingSummary['distribution'];

/** POST /api/parts/:id/ratings answers 201 (new) or 200 (replaced) with this. */
export interface RatingSaved {
  id: number;
  stars: number;
  comment: string | null;
}

export interface RatingItem {
  id: number;
  stars: number;
  comment: string | null;
  author: EvidenceAuthorRef;
  updatedAt: string;
}

/** GET /api/parts/:id/ratings */
export interface PartRatings {
  items: RatingItem[];
  summary: RatingSummary;
  /** The signed-in member's own rating, if any. */
  mine: RatingSaved | null;
}

export interface SetReportPhoto {
  id: number;
  processing: 'ready' | 'pending' | 'failed';
  /** Null until the photo has been cleaned. */
  thumbnailUrl: string | null;
  displayUrl: string | null;
}

export interface SetReportItem {
  id: number;
  production: string;
  daysInUse: number;
  conditions: SetCondition[];
  /** The part's recipe it was printed with, or null for the reporter's own settings. */
  recipeId: number | null;
  material: string;
  infillPct: number | null;
  walls: number | null;
  outcome: SetReportOutcome;
  notes: string | null;
  author: EvidenceAuthorRef;
  createdAt: string;
  photos: SetReportPhoto[];
}

/** GET /api/parts/:id/reports?material=&condition=&outcome= */
export interface SetReportList {
  items: SetReportItem[];
}

/** POST /api/parts/:id/reports answers 201 with this. */
export interface ReportFiled {
  id: number;
}

export type EvidenceEntryType = 'rating' | 'report';

/** POST /api/ratings/:id/flag and /api/reports/:id/flag */
export interface FlagResult {
  flagged: boolean;
  /** The member had flagged it before; nothing changed. */
  alreadyFlagged: boolean;
}

/** GET /api/review/flags (moderators): one flagged entry with every open flag on it. */
export interface FlaggedEntry {
  type: EvidenceEntryType;
  id: number;
  partId: number;
  /** The rating's comment or the report's notes. */
  text: string | null;
  flags: { reason: string; at: string }[];
}

/** POST /api/review/ratings/:id/hide and /api/review/reports/:id/hide */
export interface HideResult {
  id: number;
  hidden: boolean;
}

export interface ProfilePart {
  id: number;
  slug: string;
  title: string;
  proven: number;
  reports: number;
  heldUp: number;
  rating: { mean: number | null; count: number };
  warnings: string[];
}

/** GET /api/users/:id/profile */
export interface CrewProfile {
  user: { id: number; displayName: string; crewRole: string | null; memberSince: string };
  /** Their parts on the shelf, newest first. */
  parts: ProfilePart[];
}
