// What the review desk and notice endpoints answer, for the client. The server builds these in
// server/modules/review/service.ts and server/modules/notices/service.ts.
import type { SafetyFlags } from '../catalogue';
import type { ReviewAction, REVIEW_CHECKLIST } from '../review';
import type { NoticeInfo } from '../types';
import type { PartDetail, PartHistoryItem } from './parts';

/** GET /api/review/queue → { items } */
export interface ReviewQueueItem {
  partId: number;
  slug: string;
  title: string;
  revisionId: number;
  revisionNumber: number;
  isRevisionOfPublished: boolean;
  submittedAt: string;
  ageHours: number;
  contributor: { id: number; displayName: string };
  category: { slug: string; label: string };
  safety: SafetyFlags;
  thumbnailUrl: string | null;
  warnings: string[];
}

export interface ReviewChange {
  field: string;
  label: string;
  before: string;
  after: string;
}

/** GET /api/review/:partId */
export interface ReviewDetail {
  submission: PartDetail;
  published: PartDetail | null;
  changes: ReviewChange[];
  warnings: string[];
  checklist: typeof REVIEW_CHECKLIST;
  allowedActions: ReviewAction[];
  ownSubmission: boolean;
  /** The viewer changed this revision: they may send it back or reject it, another moderator approves. */
  editedByYou: boolean;
  history: PartHistoryItem[];
}

/** POST /api/review/:partId/{approve,send-back,reject,retire} */
export interface ReviewDecisionResult {
  id: number;
  slug: string;
  status: PartDetail['status'];
  revision: { number: number; status: PartDetail['revision']['status'] };
}

/** GET /api/notices */
export interface NoticeList {
  items: NoticeInfo[];
  unread: number;
}
