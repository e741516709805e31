// What the parts and vocabulary endpoints answer, for the client. The server builds these in
// server/modules/parts/presenter.ts and server/modules/vocab/routes.ts;
// tests/unit/api-shapes.test.ts checks at compile time that the two stay in step.
import type { PartVisibilityInfo } from './crews';
import type { CategorySlug, MountStandard, MountSlug, SafetyFlag, SafetyFlags } from '../catalogue';
import type { AdaptationRule, LicenceId } from '../licences';
import type { MaterialInfo } from '../materials';
import type { Caution } from '../safety';
import type { KeyDimension } from '../schemas/part';
import type { RecipeInput } from '../schemas/recipe';
import type { CameraBodyInfo, PartFileInfo, PartStatus, PartSummary, RevisionStatus } from '../types';

/** GET /api/vocab */
export interface Vocab {
  categories: { slug: CategorySlug; label: string }[];
  mounts: (MountStandard & { slug: MountSlug })[];
  bodies: CameraBodyInfo[];
  materials: MaterialInfo[];
  licences: VocabLicence[];
  safetyFlags: { key: SafetyFlag; label: string; hint: string }[];
}

export interface VocabLicence {
  id: LicenceId;
  name: string;
  shortName: string;
  url: string;
  attributionRequired: boolean;
  shareAlike: boolean;
  nonCommercial: boolean;
  noDerivatives: boolean;
}

/** GET /api/parts and GET /api/parts?mine=1 */
export interface PartList {
  items: PartSummary[];
}

/** POST /api/parts answers 201 with this. */
export interface PartCreated {
  id: number;
  slug: string;
  status: PartStatus;
}

export interface PartAuthorRef {
  id: number;
  displayName: string;
}

export interface PartLicence {
  id: string;
  name: string;
  shortName: string;
  url: string;
  creditDuty: string;
  /** How an adaptation of this part may be licensed; null for a licence the shelf no longer lists. */
  adaptation: AdaptationRule | null;
}

export interface PartMount {
  slug: MountSlug;
  note?: string;
  label: string;
  standard: string;
}

export interface PartRecipe extends RecipeInput {
  id: number;
  /** Temperatures outside the material's usual window, as sentences. */
  warnings: string[];
}

export interface PartLineage {
  parent: {
    id: number;
    slug: string;
    title: string;
    author: PartAuthorRef;
    licence: Omit<PartLicence, 'adaptation'> | null;
  } | null;
  adaptations: { id: number; slug: string; title: string; author: PartAuthorRef }[];
}

/** GET /api/parts/:id/history (author and moderators): one decision or submission on record. */
export interface PartHistoryItem {
  id: number;
  action: 'submit' | 'resubmit' | 'edit' | 'approve' | 'send_back' | 'reject' | 'retire' | 'hide_rating' | 'hide_report';
  note: string | null;
  revision: number | null;
  actor: PartAuthorRef;
  at: string;
  /** For an edit by someone other than the author: what changed, one line each. */
  changes: string[] | null;
}

/** GET /api/parts/:id, and the answer of PATCH /api/parts/:id and the file calls. */
export interface PartDetail {
  id: number;
  slug: string;
  status: PartStatus;
  /** The revision shown: the latest for its author and moderators, the published one for everyone else. */
  revision: { id: number; number: number; status: RevisionStatus; submittedAt: string | null };
  publishedRevisionId: number | null;
  latestRevisionId: number | null;
  publishedAt: string | null;
  createdAt: string;
  updatedAt: string;
  author: PartAuthorRef & { crewRole: string | null };
  title: string;
  summary: string;
  /** Markdown as written. */
  description: string;
  /** Rendered and cleaned by the server; safe to show as HTML. */
  descriptionHtml: string;
  category: { slug: string; label: string };
  compatibility: {
    bodies: CameraBodyInfo[];
    mounts: PartMount[];
    keyDimensions: KeyDimension[];
  };
  safety: SafetyFlags & { testedLoadKg: number | null; cautions: Caution[] };
  licence: PartLicence;
  recipes: PartRecipe[];
  files: PartFileInfo[];
  /** Bounding box of the first model file, mm. */
  sizeMm: [number, number, number] | null;
  lineage: PartLineage;
  /** Everyone on the shelf, or one crew only (its members and moderators). */
  visibility: PartVisibilityInfo;
}
