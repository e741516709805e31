// The shelf's search index: which fields of a part are searchable and how much each counts. Pure
// (no database, no Express): the service's worker thread and the benchmark build with it.
// Imports are relative so the worker thread resolves them without the @shared alias.
import lunr from 'lunr';
import { categoryLabel } from '../../../shared/catalogue';
import { indexText, mountIndexText } from '../../../shared/search/aliases';
import { bodyToken } from '../../../shared/search/bodies';
import type { FilterableDoc, SizeMm } from '../../../shared/search/filters';

/** Bumped whenever documents, fields or tokens change shape; an index file of another format is rebuilt. */
export const SEARCH_FORMAT = 2;

/**
 * Field boosts. A match in the title, the camera bodies or the mounts counts most; the summary,
 * key dimension names, category and materials next; the long description least, so a title match
 * ranks above a description-only one.
 */
export const FIELD_BOOSTS = {
  title: 10,
  bodies: 8,
  mounts: 8,
  summary: 4,
  dimensions: 3,
  category: 2,
  materials: 2,
  description: 1,
} as const;
export type SearchField = keyof typeof FIELD_BOOSTS;
export const SEARCH_FIELDS = Object.keys(FIELD_BOOSTS) as SearchField[];

export interface SearchBody {
  slug: string;
  maker: string;
  model: string;
  aliases: string[];
}

/** One published part as search sees it: plain data, serialisable, the same on both threads. */
export interface SearchDocument extends FilterableDoc {
  id: number;
  slug: string;
  title: string;
  summary: string;
  /** Markdown source of the description (the index only needs its words). */
  description: string;
  category: string;
  bodies: SearchBody[];
  mounts: { slug: string; note?: string }[];
  materials: string[];
  keyDimensions: { name: string; valueMm: number; tolMm: number }[];
  sizeMm: SizeMm | null;
  thumbnail: string | null;
  licence: string;
  adaptable: boolean;
  /** ISO time the part first went on the shelf. */
  publishedAt: string;
  publishedRevisionId: number;
  rating: number | null;
  /** Published to this crew only; such documents are left out of every search by anyone else. */
  crewId?: number | null;
}

/** "KX-8" is also indexed as "kx8", so the model name finds the part however it is typed. */
function compact(text: string): string {
  return text.toLowerCase().replace(/[^a-z0-9]+/g, '');
}

/**
 * What the index holds per field. Free text goes through indexText (units fused as in queries,
 * hyphenated words also joined, trade-synonym tokens added); bodies and mounts carry their tokens.
 */
export function indexRecord(doc: SearchDocument): Record<SearchField | 'id', string> {
  return {
    id: String(doc.id),
    title: indexText(doc.title),
    bodies: doc.bodies.flatMap((b) => [bodyToken(b.slug), b.maker, b.model, compact(b.model), ...b.aliases]).join(' '),
    mounts: indexText(mountIndexText(doc.mounts)),
    summary: indexText(doc.summary),
    dimensions: indexText(doc.keyDimensions.map((d) => d.name).join(' ')),
    category: categoryLabel(doc.category),
    materials: doc.materials.join(' '),
    description: indexText(doc.description),
  };
}

/** Builds the index with lunr's default pipeline (trimmer, English stop words, Porter stemmer). */
export function buildIndex(docs: readonly SearchDocument[]): lunr.Index {
  return lunr(function () {
    this.ref('id');
    for (const field of SEARCH_FIELDS) this.field(field, { boost: FIELD_BOOSTS[field] });
    // no term positions: we never highlight, and they would double the index size
    this.metadataWhitelist = [];
    for (const doc of docs) this.add(indexRecord(doc));
  });
}

/** What the index file holds: enough to answer searches at start-up without the database. */
export interface IndexFile {
  format: number;
  /** Of the published set the index was built from (see documents.ts). */
  fingerprint: string;
  builtAt: string;
  documents: SearchDocument[];
  /** Every camera body known when it was built (names for the body filter and the query text). */
  bodies: SearchBody[];
  index: object;
}

export function indexFileContent(documents: SearchDocument[], fingerprint: string, index: lunr.Index | object, bodies: SearchBody[] = []): string {
  const file: IndexFile = {
    format: SEARCH_FORMAT,
    fingerprint,
    builtAt: new Date().toISOString(),
    documents,
    bodies,
    index: index instanceof lunr.Index ? index.toJSON() : index,
  };
  return JSON.stringify(file);
}
