// Heavy parts a page does not need to work (the 3D view, the make page's part generator, sections
// below the fold) load after the page works: once its content and form have been painted, the page
// marks that moment (a performance mark, which `npm run bench:client` reads to tell what a visitor
// waits for from what arrives later) and the heavy part starts when the browser is next idle.
export const USABLE_MARK = 'rigshelf:usable';

/**
 * Call once the page's own content is rendered: after the next paint the page is marked usable (the
 * first mark of a page load counts) and `start` runs when the browser is idle. Returns a cancel.
 */
export function afterUsable(start: () => void): () => void {
  let cancelled = false;
  let idle: number | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  const run = () => {
    if (cancelled) return;
    cancelled = true;
    start();
  };
  // a timer set in an animation frame fires after that frame has been painted
  const frame = requestAnimationFrame(() => {
    timer = setTimeout(() => {
      if (cancelled) return;
      if (!performance.getEntriesByName(USABLE_MARK, 'mark').length) performance.mark(USABLE_MARK);
      if (typeof window.requestIdleCallback === 'function') idle = window.requestIdleCallback(run, { timeout: 1500 });
      else timer = setTimeout(run, 200);
    }, 0);
  });
  return () => {
    cancelled = true;
    cancelAnimationFrame(frame);
    if (timer !== null) clearTimeout(timer);
    if (idle !== null) window.cancelIdleCallback(idle);
  };
}

/** A desktop-sized window with a mouse: the 3D view may start on its own there; elsewhere it waits to be asked. */
export const roomyScreen = () => window.matchMedia('(pointer: fine) and (min-width: 1024px)').matches;
