import { defineStore } from 'pinia';
import { ref } from 'vue';
import { useIntervalFn } from '@vueuse/core';
import type { NoticeInfo } from '@shared/types';
import { noticesApi } from '@/api';

const POLL_MS = 60_000;

/** The bell: unread count and the latest notices, refreshed while someone is signed in. */
export const useNoticesStore = defineStore('notices', () => {
  const items = ref<NoticeInfo[]>([]);
  const unread = ref(0);
  const poll = useIntervalFn(() => void refresh(), POLL_MS, { immediate: false });

  async function refresh() {
    try {
      const list = await noticesApi.list();
      items.value = list.items;
      unread.value = list.unread;
    } catch {
      // a missed refresh is retried on the next tick
    }
  }

  function start() {
    if (poll.isActive.value) return;
    void refresh();
    poll.resume();
  }

  function stop() {
    poll.pause();
    items.value = [];
    unread.value = 0;
  }

  async function markRead(notice: NoticeInfo) {
    if (notice.read) return;
    await noticesApi.read(notice.id);
    notice.read = true;
    unread.value = Math.max(0, unread.value - 1);
  }

  async function markAllRead() {
    await noticesApi.readAll();
    for (const n of items.value) n.read = true;
    unread.value = 0;
  }

  return { items, unread, refresh, start, stop, markRead, markAllRead };
});
