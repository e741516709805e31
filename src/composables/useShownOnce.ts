import { onBeforeUnmount, ref, watch, type Ref } from 'vue';

/**
 * True from the moment the element comes near the viewport, and from then on: for sections whose
 * code or data are fetched only when someone scrolls to them.
 */
export function useShownOnce(target: Ref<HTMLElement | null>, rootMargin = '200px') {
  const shown = ref(false);
  let observer: IntersectionObserver | null = null;
  const stop = () => {
    observer?.disconnect();
    observer = null;
  };
  watch(
    target,
    (el) => {
      stop();
      if (!el || shown.value) return;
      if (typeof IntersectionObserver === 'undefined') {
        shown.value = true;
        return;
      }
      observer = new IntersectionObserver(
        (entries) => {
          if (entries.some((e) => e.isIntersecting)) {
            shown.value = true;
            stop();
          }
        },
        { rootMargin },
      );
      observer.observe(el);
    },
    { immediate: true, flush: 'post' },
  );
  onBeforeUnmount(stop);
  return shown;
}
