// `npm run cluster`: three app instances behind haproxy on a three-node Galera cluster and an S3
// fake, all on loopback (ports from CLUSTER_PORT_BASE, 3440 unless set; data in .cluster/ or
// CLUSTER_DIR). Ctrl-C or SIGTERM stops everything in order; the next run reuses the data.
import { resolve } from 'node:path';
import { z } from 'zod';
import { ensureClientBuilt } from '../build-client';
import { Cluster, ROOT } from './cluster';
import { clusterPorts } from './ports';

const settings = z
  .object({
    CLUSTER_DIR: z.string().min(1).default(resolve(ROOT, '.cluster')),
    CLUSTER_PORT_BASE: z.string().optional(),
    CLUSTER_STORAGE: z.enum(['s3', 'local'], { error: 'CLUSTER_STORAGE is s3 (the S3 fake) or local (one shared folder)' }).default('s3'),
    CLUSTER_SST: z.enum(['mariabackup', 'rsync'], { error: 'CLUSTER_SST is mariabackup or rsync' }).default('mariabackup'),
    CLUSTER_LOG: z.enum(['0', '1']).default('1'),
    CLUSTER_SERVER: z.enum(['compiled', 'tsx'], { error: 'CLUSTER_SERVER is compiled (dist-server/) or tsx (the sources)' }).default('compiled'),
  })
  .safeParse(process.env);
if (!settings.success) {
  console.error(`cluster: Invalid configuration:\n${settings.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n')}`);
  process.exit(1);
}
const s = settings.data;

let cluster: Cluster;
try {
  cluster = new Cluster({
    dir: resolve(s.CLUSTER_DIR),
    ports: clusterPorts(s.CLUSTER_PORT_BASE),
    storage: s.CLUSTER_STORAGE,
    sst: s.CLUSTER_SST,
    demo: true,
    server: s.CLUSTER_SERVER,
    onInstanceLine: s.CLUSTER_LOG === '1' ? (name, line) => console.log(`[${name}] ${line}`) : undefined,
  });
} catch (err) {
  console.error(`cluster: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
}

let stopping: Promise<void> | null = null;
const stop = (why: string) => {
  stopping ??= (async () => {
    console.log(`cluster: ${why}; stopping`);
    await cluster.stop().catch((err) => console.error(`cluster: stop failed: ${String(err)}`));
  })();
  return stopping;
};
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => void stop(`${signal} received`).then(() => process.exit(0)));
}

try {
  ensureClientBuilt();
  await cluster.start();
} catch (err) {
  console.error(`cluster: could not start: ${err instanceof Error ? err.message : String(err)}`);
  await stop('start failed');
  process.exit(1);
}
if (!stopping) console.log(cluster.describe());
// an instance that dies on its own is reported; haproxy keeps serving from the others
for (const instance of cluster.instances) {
  instance.child?.once('exit', (code, signal) => {
    if (!stopping) console.log(`cluster: ${instance.name} exited (code ${code}, signal ${signal}); the others keep serving`);
  });
}
