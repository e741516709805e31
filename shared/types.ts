// Types that cross the wire, used by the server and the client alike.
export const ROLES = ['member', 'moderator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ACCOUNT_STATUSES = ['active', 'suspended'] as const;
export type AccountStatus = (typeof ACCOUNT_STATUSES)[number];

export interface PublicUser {
  id: number;
  email: string;
  displayName: string;
  role: Role;
  status: AccountStatus;
  crewRole: string | null;
  createdAt: string;
  /** The account opened the confirmation link sent to its e-mail address. */
  emailVerified: boolean;
}

/** Every error the API returns has this body. */
export interface ApiErrorBody {
  error: {
    code: string;
    message: string;
    fields?: Record<string, string>;
  };
}

export const MAIL_STATUSES = ['queued', 'sent', 'failed'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

/** One row of the mail outbox, as admins see it (GET /api/admin/mail). */
export interface OutboxItem {
  id: number;
  to: string;
  subject: string;
  status: MailStatus;
  attempts: number;
  lastError: string | null;
  createdAt: string;
  sentAt: string | null;
}

/** A mail caught by the local fake SMTP server (GET /api/dev/mailbox, development only). */
export interface MailboxMessage {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  receivedAt: string;
}

export interface HealthStatus {
  status: 'ok' | 'degraded';
  db: 'up' | 'down';
}

export const PART_STATUSES = ['draft', 'in_review', 'published', 'sent_back', 'rejected', 'retired'] as const;
export type PartStatus = (typeof PART_STATUSES)[number];
export const REVISION_STATUSES = ['draft', 'in_review', 'published', 'sent_back', 'rejected', 'superseded'] as const;
export type RevisionStatus = (typeof REVISION_STATUSES)[number];
export const FILE_KINDS = ['model', 'photo', 'source'] as const;
export type FileKind = (typeof FILE_KINDS)[number];
/** Where a stored picture (a cleaned photo, a drawn model) is: waiting for its worker, done, or given up on. */
export const PROCESSING_STATES = ['ready', 'pending', 'failed'] as const;
export type ProcessingState = (typeof PROCESSING_STATES)[number];

export interface CameraBodyInfo {
  slug: string;
  maker: string;
  model: string;
  aliases: string[];
}

export interface LicenceRef {
  id: string;
  name: string;
  url: string;
}

export interface PartFileInfo {
  id: number;
  kind: FileKind;
  name: string;
  sizeBytes: number;
  sha256: string;
  format: string | null;
  /** Mesh figures of a model file (mm, mm², mm³). */
  analysis: {
    sizeMm: [number, number, number];
    volumeMm3: number;
    areaMm2: number;
    facets: number;
    watertight: boolean;
    shells: number;
    insideOut: boolean;
    degenerateFacets: number;
    openEdges: number;
    nonManifoldEdges: number;
    /** The fields below are null for files analysed before the winding and welding checks existed. */
    zeroAreaFacets: number | null;
    windingConsistent: boolean | null;
    /** Facets wound against the rest of their shell. */
    reversedFacets: number | null;
    insideOutShells: number | null;
    /** The volume counts reversed facets or inside-out shells as flipped. */
    volumeRepaired: boolean | null;
    /** Vertices merged within the welding tolerance to close hairline seams. */
    weldedVertices: number | null;
    weldToleranceMm: number | null;
    warnings: string[];
  } | null;
  /** Photos: processing state and the URLs of the cleaned images once ready. */
  processing: 'ready' | 'pending' | 'failed';
  /** Models: the shaded preview picture drawn on the server (null for photos and sources). Once it is
   * ready, thumbnailUrl and displayUrl point to it. */
  picture: 'ready' | 'pending' | 'failed' | null;
  thumbnailUrl: string | null;
  displayUrl: string | null;
  downloadUrl: string;
}

export interface PartSummary {
  id: number;
  slug: string;
  title: string;
  summary: string;
  status: PartStatus;
  category: string;
  author: { id: number; displayName: string };
  thumbnailUrl: string | null;
  sizeMm: [number, number, number] | null;
  updatedAt: string;
  /** Set when the part is published to one crew only. */
  crewId?: number | null;
}

export interface NoticeInfo {
  id: number;
  kind: string;
  title: string;
  body: string;
  link: string | null;
  read: boolean;
  createdAt: string;
}
