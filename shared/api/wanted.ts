// What /api/wanted answers.
import type { WantedCloseReason, WantedStatus } from '../schemas/wanted';
import type { BuildBody } from './builds';

export interface WantedPerson {
  id: number;
  displayName: string;
}

export interface WantedAnswerInfo {
  id: number;
  note: string;
  answeredBy: WantedPerson;
  createdAt: string;
  part: {
    id: number;
    slug: string;
    title: string;
    /** 'published' parts open on the shelf; others are still with the review desk. */
    status: string;
    onShelf: boolean;
  };
}

export interface WantedListItem {
  id: number;
  title: string;
  status: WantedStatus;
  closeReason: WantedCloseReason | null;
  body: BuildBody | null;
  mounts: { slug: string; label: string }[];
  neededBy: string | null;
  author: WantedPerson;
  answers: number;
  thumbnail: string | null;
  createdAt: string;
}

export interface WantedList {
  items: WantedListItem[];
}

export interface WantedDetail extends WantedListItem {
  details: string;
  keySizes: { name: string; valueMm: number; tolMm: number }[];
  searchedFor: string | null;
  closedAt: string | null;
  closedBy: WantedPerson | null;
  closeNote: string | null;
  photos: { id: number; processing: 'pending' | 'ready' | 'failed'; thumbnailUrl: string | null; displayUrl: string | null }[];
  answerList: WantedAnswerInfo[];
  /** What the viewer may do here. */
  can: { answer: boolean; close: boolean; closeAsSpam: boolean };
}
