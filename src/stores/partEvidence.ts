// What the crew has said about the part on screen: the proven figure, the ratings and every set
// report. The part page, its caution block and the rate-and-report flow read the same copy, so a
// report filed at wrap shows on the part page as soon as the member is back there.
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { Evidence, PartRatings, SetReportItem } from '@shared/api/evidence';
import { evidenceApi } from '@/api';
import { usePollWhilePending } from '@/composables/usePollWhilePending';

// report photos are cleaned on the server after upload: look again a few times while any is pending
const PHOTO_POLL_MS = 2500;
const PHOTO_POLL_TRIES = 12;

export const usePartEvidenceStore = defineStore('partEvidence', () => {
  const partId = ref<number | null>(null);
  const proven = ref<Evidence | null>(null);
  const ratings = ref<PartRatings | null>(null);
  /** Every visible report, newest first (the list filters its own copy). */
  const reports = ref<SetReportItem[]>([]);
  const loading = ref(false);
  const failed = ref('');
  /** Bumped on every load, so a late answer for another part is dropped. */
  let generation = 0;
  const photoPoll = usePollWhilePending(
    async () => {
      const id = partId.value;
      if (id === null) return;
      const mine = generation;
      const list = await evidenceApi.reports(id);
      if (mine === generation) reports.value = list;
    },
    () => reports.value.some((r) => r.photos.some((p) => p.processing === 'pending')),
    PHOTO_POLL_MS,
    PHOTO_POLL_TRIES,
  );

  const warnings = computed(() => proven.value?.warnings ?? []);

  function clear() {
    photoPoll.stop();
    generation += 1;
    partId.value = null;
    proven.value = null;
    ratings.value = null;
    reports.value = [];
    failed.value = '';
  }

  async function load(id: number) {
    photoPoll.stop();
    const mine = ++generation;
    if (partId.value !== id) {
      proven.value = null;
      ratings.value = null;
      reports.value = [];
    }
    partId.value = id;
    loading.value = true;
    failed.value = '';
    try {
      const [p, r, list] = await Promise.all([evidenceApi.proven(id), evidenceApi.ratings(id), evidenceApi.reports(id)]);
      if (mine !== generation) return;
      proven.value = p;
      ratings.value = r;
      reports.value = list;
      photoPoll.start();
    } catch {
      if (mine === generation) failed.value = 'What the crew said about this part could not be loaded. Reload the page to try again.';
    } finally {
      if (mine === generation) loading.value = false;
    }
  }

  /** Loads again what the current part has (after rating, flagging or hiding). */
  function refresh() {
    return partId.value === null ? Promise.resolve() : load(partId.value);
  }

  return { partId, proven, ratings, reports, loading, failed, warnings, load, refresh, clear };
});
