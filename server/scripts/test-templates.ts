// Names of the demo templates of one `npm test` run: the seeded demo shelf, kept once per run and
// copied into each test file that wants it (tests/helpers/demo-template.ts), dropped after the run.
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** `scenario`: the seeders the demo tests were written against (up to 0011); `full`: the whole demo shelf. */
export type DemoKind = 'scenario' | 'full';
export const DEMO_KINDS: DemoKind[] = ['scenario', 'full'];

/** Under the `rigshelf_t_` prefix the test user may create. */
export function templateDatabase(run: string, kind: DemoKind): string {
  return `rigshelf_t_tpl_${run}_${kind}`;
}

export function templateFolder(run: string, kind: DemoKind): string {
  return join(tmpdir(), `rigshelf-demo-template-${run}-${kind}`);
}
