// Tasks for testing the worker pool itself: loaded inside its threads through worker-boot.mjs.
export function echo(input: { value: number }): { value: number; doubled: number } {
  return { value: input.value, doubled: input.value * 2 };
}

/** Never returns on its own: only the pool's time limit ends it. */
export function spin(): never {
  for (;;) {
    // busy, as a runaway decode would be
  }
}

/** Keeps allocating small objects on the V8 heap until the thread's memory limit stops it. */
export function hoard(): number {
  const kept: object[] = [];
  for (;;) kept.push({ index: kept.length, padding: 'x'.repeat(64) + kept.length });
}

/** Keeps the thread busy for `ms` of wall-clock time, as a real analysis would. */
export function busy({ ms }: { ms: number }): number {
  const until = Date.now() + ms;
  let turns = 0;
  while (Date.now() < until) turns += 1;
  return turns;
}
