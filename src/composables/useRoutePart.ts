import { ref, watch } from 'vue';
import { useRoute } from 'vue-router';
import type { PartDetail } from '@shared/api/parts';
import { isApiError, partsApi } from '@/api';

/**
 * The part named by the route's :id (numeric id or slug), loaded again when the id changes.
 * `loaded` runs with each freshly loaded part, for what a view sets up around it.
 */
export function useRoutePart(loaded: (part: PartDetail, id: string) => void | Promise<void>) {
  const route = useRoute();
  const part = ref<PartDetail | null>(null);
  const loading = ref(true);
  const missing = ref('');

  async function load(id: string) {
    loading.value = true;
    missing.value = '';
    try {
      const p = await partsApi.get(id);
      part.value = p;
      await loaded(p, id);
    } catch (err) {
      part.value = null;
      missing.value = isApiError(err) ? err.message : 'The part could not be loaded. Reload the page and try again.';
    } finally {
      loading.value = false;
    }
  }

  watch(
    () => route.params.id,
    (id) => {
      if (typeof id === 'string') void load(id);
    },
    { immediate: true },
  );

  return { part, loading, missing, reload: load };
}
