// Asking the API for the search in the address: the results, the facet counts each tick would leave,
// and what the API refused, sorted by where on the page it belongs.
import { computed, ref, watch, type Ref } from 'vue';
import { useRoute } from 'vue-router';
import type { SearchResponse } from '@shared/api/search';
import { isApiError, searchApi, type FitMark } from '@/api';
import { FACET_KINDS, toSearchParams, type FacetKind, type SearchState } from '@/composables/useSearchRoute';

// with build=, each result also carries its fit to the build (server/modules/search/build-route.ts)
export type SearchAnswer = Omit<SearchResponse, 'results'> & { results: (SearchResponse['results'][number] & { fit?: FitMark })[] };

const FIELD_NAMES: Record<string, string> = {
  mount: 'Mount standard',
  body: 'Camera body',
  category: 'Category',
  material: 'Material',
  adaptable: 'Licence',
  minRating: 'Lowest rating',
  sort: 'Sort',
  page: 'Page',
  pageSize: 'Page size',
  build: 'Build',
};
/** What "Drop it" changes for a refused value that came in with a link. */
export const RESET: Record<string, Partial<SearchState>> = {
  mount: { mount: [] },
  body: { body: [] },
  category: { category: [] },
  material: { material: [] },
  adaptable: { adaptable: false },
  minRating: { minRating: null },
  sort: { sort: 'relevance' },
  page: {},
  pageSize: { pageSize: null },
  build: { build: null },
};

export function useSearchResults(state: Ref<SearchState>) {
  const route = useRoute();
  const response = ref<SearchAnswer | null>(null);
  /** Facet counts of the same search without that kind's own filter, for kinds with a tick. */
  const without = ref<Partial<Record<FacetKind, Record<string, number>>>>({});
  const loading = ref(true);
  const failure = ref<{ status: number; message: string; fields: Record<string, string> } | null>(null);
  let asked = 0;

  const requestKey = computed(() => JSON.stringify(toSearchParams(state.value)));

  async function load() {
    const s = state.value;
    const params = toSearchParams(s);
    const mine = ++asked;
    loading.value = true;
    const ticked = FACET_KINDS.filter((k) => s[k].length > 0);
    try {
      const [main, ...others] = await Promise.all([
        searchApi.search(params),
        ...ticked.map((k) => searchApi.search({ ...params, [k]: undefined, page: undefined, pageSize: 1, build: undefined })),
      ]);
      if (mine !== asked) return;
      response.value = main;
      without.value = Object.fromEntries(ticked.map((k, i) => [k, others[i].facets[k]]));
      failure.value = null;
    } catch (err) {
      if (mine !== asked) return;
      failure.value = isApiError(err)
        ? { status: err.status, message: err.message, fields: err.fields }
        : { status: 0, message: 'The search did not finish. Try again.', fields: {} };
      // the last results stay, dimmed, under the message: typing query syntax passes through unreadable states
    } finally {
      if (mine === asked) loading.value = false;
    }
  }

  watch(
    requestKey,
    () => {
      if (route.name === 'search') void load();
    },
    { immediate: true },
  );

  /** Where, on this page, the parts matching only some of the typed words begin (-1: none). */
  const firstPartial = computed(() => (response.value?.results ?? []).findIndex((r) => r.missing?.length));

  const refused = computed(() => (failure.value && [400, 422].includes(failure.value.status) ? failure.value : null));
  const fieldErrors = computed(() => refused.value?.fields ?? {});
  /** The API's word on the search text. */
  const serverQueryError = computed(() => {
    if (!refused.value) return '';
    // a search the query syntax cannot read: the whole message explains the syntax
    if (refused.value.status === 400 && fieldErrors.value.q) return refused.value.message;
    return fieldErrors.value.q ?? '';
  });
  /** Refusals about values that came in with a link rather than from a field on this page. */
  const otherErrors = computed(() =>
    Object.entries(fieldErrors.value)
      .filter(([key]) => !['q', 'fit', 'dim'].includes(key))
      .map(([key, message]) => ({ key, name: FIELD_NAMES[key] ?? key, message })),
  );
  const networkError = computed(() => (failure.value && !refused.value ? failure.value.message : ''));

  const totalPages = computed(() => (response.value ? Math.max(1, Math.ceil(response.value.total / response.value.pageSize)) : 1));
  const firstShown = computed(() => (response.value ? (response.value.page - 1) * response.value.pageSize + 1 : 0));

  return { response, without, loading, load, firstPartial, refused, fieldErrors, serverQueryError, otherErrors, networkError, totalPages, firstShown };
}
