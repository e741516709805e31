// What GET /api/search answers, for the client. Built by server/modules/search/searcher.ts.
import type { FacetCounts } from '../search/filters';

export interface SearchResultItem {
  id: number;
  slug: string;
  title: string;
  summary: string;
  /** Bounding box of the first model file, in millimetres, as drawn (not sorted). */
  sizeMm: [number, number, number] | null;
  mounts: { slug: string; label: string; note?: string }[];
  bodies: { slug: string; maker: string; model: string }[];
  /** Mean of the crew's ratings (1–5), null when nobody has rated it; always shown with ratingCount. */
  rating: number | null;
  ratingCount: number;
  /** Wilson lower bound of the share of set reports that held up (0 with no reports). */
  proven: number;
  reports: number;
  /** Counted set reports that say it held up or kept working: shown first, as "2 of 2 held up". */
  heldUp: number;
  /** URL of the first cleaned photo's thumbnail, if there is one. */
  thumbnail: string | null;
  /** Relevance from the text match (0 when there was no search text). */
  score: number;
  /**
   * Which of the typed words and phrases ("15mm", "v-style", "receiver") the part matched, and
   * which it did not; both empty without search text or for query syntax. Parts matching more
   * words come first, so `missing` is empty on the best results.
   */
  matched: string[];
  missing: string[];
  /** True for a part published to one of the searcher's crews only. */
  crewOnly?: boolean;
}

export interface SearchResponse {
  /** Parts matching the text and every filter. */
  total: number;
  page: number;
  pageSize: number;
  /** Counted over all `total` matches, not just this page. */
  facets: FacetCounts;
  results: SearchResultItem[];
}
