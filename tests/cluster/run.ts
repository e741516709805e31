// `npm run test:cluster`: the cluster fault run (tests/cluster/harness.ts); prints the figures and
// exits 1 if anything did not hold. `-- --short` runs the shorter form (6 members, 60 s), `-- --ci`
// a form sized for CI (4 members, 40 s: the same faults and checks in about two minutes);
// `-- --set name=value` changes one figure; CLUSTER_STORAGE=local uses a shared folder instead of
// the S3 fake; CLUSTER_SERVER=tsx runs the instances from the sources instead of dist-server/;
// CLUSTER_PORT_BASE moves every port.
import { CI_FORM, formatSummary, LONG_FORM, runClusterFaults, SHORT_FORM, verdict, type ClusterRunOptions } from './harness';

const options: ClusterRunOptions = {
  ...(process.argv.includes('--ci') ? CI_FORM : process.argv.includes('--short') ? SHORT_FORM : LONG_FORM),
  storage: process.env.CLUSTER_STORAGE === 'local' ? 'local' : 's3',
  server: process.env.CLUSTER_SERVER === 'tsx' ? 'tsx' : 'compiled',
  portBase: process.env.CLUSTER_PORT_BASE,
};
for (const [i, arg] of process.argv.entries()) {
  if (arg !== '--set') continue;
  const [name, value] = (process.argv[i + 1] ?? '').split('=');
  if (!(name in options) || Number.isNaN(Number(value))) throw new Error(`--set ${name}: not a figure of the cluster run`);
  (options as unknown as Record<string, unknown>)[name] = Number(value);
}
const summary = await runClusterFaults(options);
console.log(formatSummary(summary));
const problems = verdict(summary);
if (problems.length) {
  console.log(`\nDID NOT HOLD:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
  process.exit(1);
}
console.log('\nheld: every acknowledged write once, no orphans, photo jobs once, search fresh on every instance, sessions kept, clean 503s, 3 nodes Synced');
process.exit(0);
