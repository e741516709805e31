import { defineStore } from 'pinia';
import { ref } from 'vue';
import type { Vocab } from '@shared/api/parts';
import { partsApi } from '@/api';

/** The shelf's word lists (categories, mounts, camera bodies, materials, licences), loaded once. */
export const useVocabStore = defineStore('vocab', () => {
  const vocab = ref<Vocab | null>(null);
  let loading: Promise<Vocab> | null = null;

  function ensureLoaded(): Promise<Vocab> {
    if (vocab.value) return Promise.resolve(vocab.value);
    loading ??= partsApi
      .vocab()
      .then((v) => {
        vocab.value = v;
        return v;
      })
      .finally(() => {
        loading = null;
      });
    return loading;
  }

  function bodyLabel(slug: string): string {
    const body = vocab.value?.bodies.find((b) => b.slug === slug);
    return body ? `${body.maker} ${body.model}` : slug;
  }

  return { vocab, ensureLoaded, bodyLabel };
});
