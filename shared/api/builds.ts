// What /api/builds and GET /api/search?build=<id> answer.
import type { FitReason, FitVerdict } from '../build-fit';
import type { SearchResponse, SearchResultItem } from './search';

export interface BuildBody {
  slug: string;
  maker: string;
  model: string;
}

export interface BuildInfo {
  id: number;
  name: string;
  body: BuildBody | null;
  mounts: { slug: string; label: string }[];
  keySizes: { name: string; valueMm: number; tolMm: number }[];
  createdAt: string;
  updatedAt: string;
}

export interface BuildList {
  items: BuildInfo[];
}

export interface FitMark {
  verdict: FitVerdict;
  summary: string;
  reasons: FitReason[];
}

export type BuildSearchResultItem = SearchResultItem & { fit: FitMark };

/** A search answered for a build: compatible parts first, each with its fit mark. */
export interface BuildSearchResponse extends Omit<SearchResponse, 'results'> {
  build: { id: number; name: string };
  /** How many of the ranked matches were ordered by fit (the rest follow by relevance). */
  rankedByFit: number;
  /** Counts of each verdict among the ranked matches. */
  fitCounts: Record<FitVerdict, number>;
  results: BuildSearchResultItem[];
}
