import { defineStore } from 'pinia';
import { computed, ref, watch } from 'vue';
import { useIntervalFn, useOnline } from '@vueuse/core';
import type { RatingInput, SetReportInput } from '@shared/schemas/evidence';
import { isApiError, queuedApi } from '@/api';
import { onStoredCopy } from '@/api/http';
import type * as Queue from '@/offline/queue';
import { OFFLINE_CACHE, OFFLINE_IMAGE_CACHE } from '@/offline/routes';
import { newWriteKey } from '@/lib/write-key';
import { useAuthStore } from '@/stores/auth';

const RETRY_MS = 30_000;

// IndexedDB (idb) is opened only when a member's queue is read or written: a visitor's page never loads it
const openQueue = () => import('@/offline/queue');

/**
 * No signal on set: whether the browser is online, how old the copy on screen is ("as of"), and the
 * set reports and ratings waiting on this device. The queue is sent once when the signal returns
 * (one run at a time); an entry the server refuses stays, with the reason, until the member drops it.
 */
export const useOfflineStore = defineStore('offline', () => {
  const online = useOnline();
  /** The oldest stored copy shown since the page changed, ISO time. */
  const asOf = ref<string | null>(null);
  const entries = ref<Queue.QueuedEntry[]>([]);
  const sending = ref(false);
  const lastSent = ref(0);
  let running: Promise<void> | null = null;
  const retry = useIntervalFn(
    () => {
      if (online.value && waiting.value) void flush();
    },
    RETRY_MS,
    { immediate: false },
  );

  const waiting = computed(() => entries.value.filter((e) => !e.problem).length);
  const refused = computed(() => entries.value.filter((e) => e.problem));

  /** The signed-in member's entries: another member's wait for them to sign in again. */
  async function mine(): Promise<Queue.QueuedEntry[]> {
    const me = useAuthStore().user?.id;
    return me === undefined ? [] : (await (await openQueue()).all()).filter((e) => e.userId === me);
  }

  async function reload() {
    try {
      entries.value = await mine();
    } catch {
      entries.value = [];
    }
  }

  function pageChanged() {
    asOf.value = null;
  }

  async function sendOne(entry: Queue.QueuedEntry): Promise<'sent' | 'offline' | 'refused'> {
    const queue = await openQueue();
    try {
      if (entry.kind === 'report') await queuedApi.fileReport(entry.partId, entry.input, entry.photos, entry.key);
      else await queuedApi.rate(entry.partId, entry.input, entry.key);
      await queue.remove(entry.key);
      return 'sent';
    } catch (err) {
      if (!isApiError(err) || err.status === 0 || err.status >= 500 || err.status === 401 || err.status === 403) return 'offline';
      await queue.put({ ...entry, problem: err.message });
      return 'refused';
    }
  }

  /** Sends what waits, oldest first; stops at the first entry the network cannot carry. */
  function flush(): Promise<void> {
    running ??= (async () => {
      sending.value = true;
      try {
        let sent = 0;
        await useAuthStore().ensureLoaded();
        for (const entry of await mine()) {
          if (entry.problem) continue;
          const result = await sendOne(entry);
          if (result === 'offline') break;
          if (result === 'sent') sent += 1;
        }
        lastSent.value = sent;
      } catch {
        // IndexedDB unavailable: nothing was queued either
      } finally {
        sending.value = false;
        running = null;
        await reload();
      }
    })();
    return running;
  }

  function me(): number {
    const id = useAuthStore().user?.id;
    if (id === undefined) throw new Error('Sign in again to keep this on the device.');
    return id;
  }

  async function queueReport(part: { id: number; slug: string; title: string }, input: SetReportInput, photos: File[]) {
    const queue = await openQueue();
    await queue.put({
      key: newWriteKey(),
      userId: me(),
      kind: 'report',
      partId: part.id,
      partSlug: part.slug,
      partTitle: part.title,
      input,
      photos,
      photoNames: photos.map((p) => p.name),
      writtenAt: new Date().toISOString(),
      problem: null,
    });
    await reload();
  }

  async function queueRating(part: { id: number; slug: string; title: string }, input: RatingInput) {
    const queue = await openQueue();
    await queue.put({
      key: newWriteKey(),
      userId: me(),
      kind: 'rating',
      partId: part.id,
      partSlug: part.slug,
      partTitle: part.title,
      input,
      writtenAt: new Date().toISOString(),
      problem: null,
    });
    await reload();
  }

  async function drop(key: string) {
    await (await openQueue()).remove(key);
    await reload();
  }

  /** The stored copies of pages leave the device (at sign-in and sign-out: they belong to one member). */
  async function forgetCopies() {
    asOf.value = null;
    if (typeof caches !== 'undefined') await Promise.all([caches.delete(OFFLINE_CACHE), caches.delete(OFFLINE_IMAGE_CACHE)]).catch(() => undefined);
  }

  function start() {
    onStoredCopy((_path, storedAt) => {
      if (!asOf.value || storedAt < asOf.value) asOf.value = storedAt;
    });
    watch(online, (isOnline) => {
      if (isOnline) void flush();
    });
    retry.resume();
    void useAuthStore()
      .ensureLoaded()
      .then(reload)
      .then(() => {
        if (online.value && waiting.value) void flush();
      });
  }

  return { online, asOf, entries, waiting, refused, sending, lastSent, pageChanged, flush, queueReport, queueRating, drop, forgetCopies, start };
});
