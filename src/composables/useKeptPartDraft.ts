// The submit form's draft, kept on this device (IndexedDB, lib/draftStorage.ts) until it is sent or
// discarded: written a moment after each change, before the form switches flows, when the view goes
// and when the tab is closed, which also asks before the page is left with unsent changes.
import { onBeforeUnmount, watch, type Ref } from 'vue';
import { useEventListener, useTimeoutFn } from '@vueuse/core';
import { discardDraft, saveDraft } from '@/lib/draftStorage';
import { useAuthStore } from '@/stores/auth';
import { usePartDraftStore } from '@/stores/partDraft';

const SAVE_AFTER_MS = 400;

/** `loading` and `loadError` are the form's: nothing is written while it is not ready. */
export function useKeptPartDraft(loading: Ref<boolean>, loadError: Ref<string>) {
  const auth = useAuthStore();
  const draft = usePartDraftStore();
  const saveLater = useTimeoutFn(() => void saveNow(), SAVE_AFTER_MS, { immediate: false });
  let saving: Promise<void> = Promise.resolve();

  /** Writes the draft of the flow on screen now (or drops it when the form is back to blank). */
  function saveNow() {
    saveLater.stop();
    const user = auth.user;
    if (!user || !draft.key || loading.value || loadError.value) return saving;
    const flow = draft.key;
    const keep = draft.hasContent;
    const snapshot = keep ? draft.snapshot() : null;
    saving = saving
      .then(() => (snapshot ? saveDraft(user.id, flow, snapshot) : discardDraft(user.id, flow)))
      .catch(() => {
        // a full or blocked browser store: the form keeps working, the leave warning still guards it
      });
    return saving;
  }

  watch(
    () => [draft.key, JSON.stringify(draft.snapshot().fields), draft.files.map((f) => f.uid).join(), draft.existing.map((e) => e.remove).join()],
    () => saveLater.start(),
  );

  /** Drops the kept draft of a flow (sent, or discarded by the contributor). */
  async function forget(flow: string) {
    saveLater.stop();
    await saving;
    if (auth.user) await discardDraft(auth.user.id, flow).catch(() => undefined);
  }

  useEventListener(window, 'beforeunload', (event: BeforeUnloadEvent) => {
    if (loading.value || !draft.hasContent) return;
    void saveNow();
    event.preventDefault();
    event.returnValue = '';
  });
  onBeforeUnmount(() => void saveNow());

  return { saveNow, forget };
}
