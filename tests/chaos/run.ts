// `npm run test:chaos`: the long chaos run (tests/chaos/harness.ts); prints a summary with figures
// and exits 1 if anything did not hold. `npm run test:chaos -- --short` runs the form `npm test` runs.
import { formatSummary, LONG_FORM, runChaos, SHORT_FORM, verdict } from './harness';

const options = { ...(process.argv.includes('--short') ? SHORT_FORM : LONG_FORM) };
// `--set name=value` changes one figure of the chosen form, e.g. --set abortedUploads=0
for (const [i, arg] of process.argv.entries()) {
  if (arg !== '--set') continue;
  const [name, value] = (process.argv[i + 1] ?? '').split('=');
  if (!(name in options) || Number.isNaN(Number(value))) throw new Error(`--set ${name}: not a figure of the chaos run`);
  (options as Record<string, unknown>)[name] = Number(value);
}
const summary = await runChaos(options);
console.log(formatSummary(summary));
const problems = verdict(summary);
if (problems.length) {
  console.log(`\nDID NOT HOLD:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
  process.exit(1);
}
console.log('\nheld: no unexpected exit, no deadlock 500s, every acknowledged write present once, no orphans, health answered, clean shutdown');
process.exit(0);
