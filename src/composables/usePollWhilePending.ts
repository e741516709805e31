import { useTimeoutPoll } from '@vueuse/core';

/**
 * Looks again every `ms` while something is still being processed on the server (photos cleaned,
 * pictures drawn after an upload), at most `tries` times. `look` fetches and stores the fresh copy;
 * a failed look ends the polling, and the page keeps what it has (a reload shows the rest).
 */
export function usePollWhilePending(look: () => Promise<void>, pending: () => boolean, ms: number, tries: number) {
  let left = 0;
  const poll = useTimeoutPoll(
    async () => {
      if (left <= 0 || !pending()) return poll.pause();
      left -= 1;
      try {
        await look();
      } catch {
        return poll.pause();
      }
      if (!pending()) poll.pause();
    },
    ms,
    { immediate: false },
  );
  return {
    /** Starts over with `tries` looks, when anything is pending. */
    start() {
      poll.pause();
      left = tries;
      if (pending()) poll.resume();
    },
    stop: poll.pause,
  };
}
