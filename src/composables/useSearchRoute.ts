import { computed } from 'vue';
import { useRoute, useRouter, type LocationQuery, type LocationQueryRaw, type LocationQueryValue } from 'vue-router';
import { SEARCH_SORTS, type SearchSort } from '@shared/search/fields';
import { splitList } from '@shared/search/fields';
import type { SearchParams } from '@/api';

/** The filters offered as lists of choices with counts. */
export const FACET_KINDS = ['mount', 'body', 'category', 'material'] as const;
export type FacetKind = (typeof FACET_KINDS)[number];

/** Everything a search is made of. It lives in the address, so a search can be sent to the crew. */
export interface SearchState {
  q: string;
  mount: string[];
  body: string[];
  category: string[];
  material: string[];
  /** As typed: "120x80x40", "4.5inx3inx1in". */
  fit: string;
  /** name:value:tolerance */
  dim: string[];
  adaptable: boolean;
  minRating: number | null;
  /** Kept as found in the address; the API says so if it is not one of SEARCH_SORTS. */
  sort: string;
  page: number;
  pageSize: number | null;
  /** One of the member's builds ("fits my build"), or null. */
  build: number | null;
}

type Value = LocationQueryValue | LocationQueryValue[] | undefined;

function one(value: Value): string {
  const v = Array.isArray(value) ? value[0] : value;
  return v ?? '';
}

function many(value: Value): string[] {
  if (value === undefined || value === null) return [];
  return splitList((Array.isArray(value) ? value : [value]).filter((v): v is string => typeof v === 'string'));
}

function whole(value: Value): number | null {
  const n = Number(one(value));
  return one(value) !== '' && Number.isInteger(n) && n > 0 ? n : null;
}

export function readSearchQuery(query: LocationQuery): SearchState {
  const minRating = Number(one(query.minRating));
  const dims = query.dim === undefined ? [] : Array.isArray(query.dim) ? query.dim : [query.dim];
  return {
    q: one(query.q),
    mount: many(query.mount),
    body: many(query.body),
    category: many(query.category),
    material: many(query.material),
    fit: one(query.fit).trim(),
    // a dimension name may hold a comma, so dim only repeats
    dim: dims.filter((d): d is string => !!d && d.trim() !== ''),
    adaptable: ['1', 'true', 'yes', 'on'].includes(one(query.adaptable).toLowerCase()),
    minRating: one(query.minRating) !== '' && Number.isFinite(minRating) ? minRating : null,
    sort: one(query.sort) || 'relevance',
    page: whole(query.page) ?? 1,
    pageSize: whole(query.pageSize),
    build: whole(query.build),
  };
}

/** The address query for a state: defaults and empty values are left out, so links stay short. */
export function toLocationQuery(s: SearchState): LocationQueryRaw {
  const query: LocationQueryRaw = {};
  if (s.q.trim()) query.q = s.q.trim();
  for (const kind of FACET_KINDS) if (s[kind].length) query[kind] = [...s[kind]];
  if (s.fit) query.fit = s.fit;
  if (s.dim.length) query.dim = [...s.dim];
  if (s.adaptable) query.adaptable = '1';
  if (s.minRating !== null) query.minRating = String(s.minRating);
  if (s.sort && s.sort !== 'relevance') query.sort = s.sort;
  if (s.page > 1) query.page = String(s.page);
  if (s.pageSize !== null) query.pageSize = String(s.pageSize);
  if (s.build !== null) query.build = String(s.build);
  return query;
}

export function toSearchParams(s: SearchState): SearchParams {
  return {
    q: s.q.trim() || undefined,
    mount: s.mount,
    body: s.body,
    category: s.category,
    material: s.material,
    fit: s.fit || undefined,
    dim: s.dim,
    adaptable: s.adaptable || undefined,
    minRating: s.minRating ?? undefined,
    sort: s.sort === 'relevance' ? undefined : (s.sort as SearchSort),
    page: s.page > 1 ? s.page : undefined,
    pageSize: s.pageSize ?? undefined,
    build: s.build ?? undefined,
  };
}

export function isSearchSort(value: string): value is SearchSort {
  return (SEARCH_SORTS as readonly string[]).includes(value);
}

/** Whether anything narrows the search beyond the text. */
export function hasFilters(s: SearchState): boolean {
  return FACET_KINDS.some((k) => s[k].length > 0) || !!s.fit || s.dim.length > 0 || s.adaptable || s.minRating !== null;
}

function sameQuery(a: LocationQueryRaw, b: LocationQuery): boolean {
  const norm = (q: LocationQueryRaw | LocationQuery) =>
    JSON.stringify(
      Object.keys(q)
        .sort()
        .map((k) => [k, ([] as unknown[]).concat(q[k] ?? [])]),
    );
  return norm(a) === norm(b);
}

export type TypedField = 'q' | 'fit' | 'dim';

/**
 * The search held in the address bar. A choice (a filter, the sort, a page) is a new history entry,
 * so the back button undoes it; typing replaces the entry it started, so one burst of typing is
 * one step back rather than one per letter.
 */
export function useSearchRoute() {
  const route = useRoute();
  const router = useRouter();
  const state = computed(() => readSearchQuery(route.query));
  let typed: { field: TypedField; fullPath: string } | null = null;

  async function go(patch: Partial<SearchState>, options: { typing?: TypedField } = {}) {
    // every change except turning the page starts again from page 1
    const next: SearchState = { ...state.value, page: 1, ...patch };
    const query = toLocationQuery(next);
    if (sameQuery(query, route.query)) return;
    const field = options.typing;
    const replace = !!field && typed?.field === field && typed.fullPath === route.fullPath;
    await (replace ? router.replace({ name: 'search', query }) : router.push({ name: 'search', query }));
    typed = field ? { field, fullPath: route.fullPath } : null;
  }

  return { state, go };
}
