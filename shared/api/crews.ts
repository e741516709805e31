// What the crews API answers.
import type { CrewRole } from '../schemas/crews';

export interface CrewMemberInfo {
  userId: number;
  displayName: string;
  role: CrewRole;
  joinedAt: string;
}

export type InvitationStatus = 'waiting' | 'accepted' | 'expired' | 'withdrawn';

export interface CrewInvitationInfo {
  id: number;
  email: string;
  role: CrewRole;
  status: InvitationStatus;
  invitedBy: string | null;
  expiresAt: string;
  createdAt: string;
}

export interface CrewSummary {
  id: number;
  name: string;
  production: string | null;
  currency: string;
  taxRatePct: number | null;
  /** The viewer's crew role; null for a moderator looking at a crew they are not in. */
  myRole: CrewRole | null;
  memberCount: number;
}

export interface CrewInfo extends CrewSummary {
  members: CrewMemberInfo[];
  /** Leads (and moderators) only; empty for members. */
  invitations: CrewInvitationInfo[];
  /** Crew-only parts on the shelf or with the review desk. */
  partCount: number;
}

/** GET /api/invitations/:token */
export interface InvitationPreview {
  crewName: string;
  production: string | null;
  role: CrewRole;
  email: string;
  invitedBy: string | null;
  expiresAt: string;
}

/** Who sees a part, as the part page shows it. */
export type PartVisibilityInfo = 'everyone' | { crewId: number; crewName: string };
