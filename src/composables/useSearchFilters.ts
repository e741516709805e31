// The search's filters as the page shows them: the lists to narrow by with the count each tick would
// leave, and what is chosen as one line of removable labels, named from the vocabulary.
import { computed, type Ref } from 'vue';
import { CATEGORY_SLUGS, categoryLabel, MOUNT_SLUGS, mountStandard } from '@shared/catalogue';
import { MATERIAL_IDS } from '@shared/materials';
import { parseDimension, parseEnvelope } from '@shared/search/fields';
import { FACET_KINDS, type FacetKind, type SearchState } from '@/composables/useSearchRoute';
import type { SearchAnswer } from '@/composables/useSearchResults';
import { useVocabStore } from '@/stores/vocab';
import { formatMm, formatSizeIn, formatSizeMm } from '@/lib/format';
import type { ChosenFilter } from '@/components/search/SearchEmpty.vue';
import type { FacetGroup, FacetOption } from '@/components/search/SearchFacets.vue';

const ORDER: Record<FacetKind, readonly string[] | null> = { mount: MOUNT_SLUGS, category: CATEGORY_SLUGS, material: MATERIAL_IDS, body: null };
const TITLES: Record<FacetKind, string> = { mount: 'Mount standard', body: 'Camera body', category: 'Category', material: 'Printed in' };
export const NO_FILTERS: Partial<SearchState> = { mount: [], body: [], category: [], material: [], fit: '', dim: [], adaptable: false, minRating: null };

function fitLabel(fit: string) {
  const parsed = parseEnvelope(fit);
  if (!parsed.ok) return `Fits within ${fit}`;
  // in the unit it was typed in
  return `Fits within ${/in|"/i.test(fit) && !/mm|cm/i.test(fit) ? formatSizeIn(parsed.value) : formatSizeMm(parsed.value)}`;
}
function dimLabel(dim: string) {
  const parsed = parseDimension(dim);
  if (!parsed.ok) return dim;
  const { name, valueMm, tolMm } = parsed.value;
  return `${name} ${formatMm(valueMm)}${tolMm ? ` ± ${formatMm(tolMm)}` : ''} mm`;
}

export function useSearchFilters(
  state: Ref<SearchState>,
  response: Ref<SearchAnswer | null>,
  without: Ref<Partial<Record<FacetKind, Record<string, number>>>>,
  go: (patch: Partial<SearchState>) => unknown,
) {
  const vocabStore = useVocabStore();

  function mountLabel(slug: string) {
    return vocabStore.vocab?.mounts.find((m) => m.slug === slug)?.label ?? mountStandard(slug)?.label ?? slug;
  }
  function labelFor(kind: FacetKind, value: string): string {
    if (kind === 'mount') return mountLabel(value);
    if (kind === 'body') return vocabStore.bodyLabel(value);
    if (kind === 'category') return categoryLabel(value);
    return value;
  }
  function hintFor(kind: FacetKind, value: string): string | undefined {
    if (kind === 'mount') return vocabStore.vocab?.mounts.find((m) => m.slug === value)?.standard ?? mountStandard(value)?.standard;
    if (kind === 'material') return vocabStore.vocab?.materials.find((m) => m.id === value)?.name.replace(/^\S+\s*\((.*)\)$/, '$1');
    return undefined;
  }

  const facetGroups = computed<FacetGroup[]>(() => {
    const r = response.value;
    if (!r) return [];
    return (['mount', 'body', 'category', 'material'] as const).map((kind) => {
      const here = r.facets[kind];
      const ticked = state.value[kind];
      // with a tick in this list the others add to the results (any of them), so the counts come from
      // the same search without this list's ticks: adding v shows total + (parts with v) − (already shown with v)
      const pool = ticked.length ? (without.value[kind] ?? here) : here;
      const values = new Set([...Object.keys(pool), ...ticked]);
      const options: FacetOption[] = [...values]
        .map((value) => {
          const on = ticked.includes(value);
          const count = on ? (here[value] ?? 0) : ticked.length ? r.total + (pool[value] ?? 0) - (here[value] ?? 0) : (pool[value] ?? 0);
          return { value, label: labelFor(kind, value), hint: hintFor(kind, value), count, on };
        })
        .filter((o) => o.on || o.count > 0);
      const order = ORDER[kind];
      options.sort((a, b) => {
        if (order) return (order.indexOf(a.value) + 1 || 999) - (order.indexOf(b.value) + 1 || 999);
        return a.label.localeCompare(b.label);
      });
      return { kind, title: TITLES[kind], options };
    });
  });

  function toggleFacet(kind: FacetKind, value: string) {
    const now = state.value[kind];
    void go({ [kind]: now.includes(value) ? now.filter((v) => v !== value) : [...now, value] });
  }

  const chosen = computed<ChosenFilter[]>(() => {
    const s = state.value;
    const out: ChosenFilter[] = [];
    for (const kind of FACET_KINDS) for (const v of s[kind]) out.push({ key: `${kind}:${v}`, label: labelFor(kind, v) });
    if (s.fit) out.push({ key: 'fit', label: fitLabel(s.fit) });
    s.dim.forEach((d, i) => out.push({ key: `dim:${i}`, label: dimLabel(d) }));
    if (s.adaptable) out.push({ key: 'adaptable', label: 'Licence allows adaptations' });
    if (s.minRating !== null) out.push({ key: 'minRating', label: `Rated ${s.minRating} or more` });
    return out;
  });

  function removeChosen(key: string) {
    const s = state.value;
    const [kind, ...rest] = key.split(':');
    const value = rest.join(':');
    if ((FACET_KINDS as readonly string[]).includes(kind)) {
      const k = kind as FacetKind;
      void go({ [k]: s[k].filter((v) => v !== value) });
    } else if (kind === 'dim') void go({ dim: s.dim.filter((_, i) => i !== Number(value)) });
    else if (kind === 'fit') void go({ fit: '' });
    else if (kind === 'adaptable') void go({ adaptable: false });
    else if (kind === 'minRating') void go({ minRating: null });
  }

  return { facetGroups, toggleFacet, chosen, removeChosen };
}
