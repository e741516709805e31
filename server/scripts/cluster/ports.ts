// The ports of the loopback cluster, all counted from one base (CLUSTER_PORT_BASE, 3440 unless set):
// base = the load balancer, +1..+3 app instances, +4..+6 MariaDB clients, +7..+9 Galera replication,
// +10..+12 IST, +13..+15 SST, +16 the S3 fake, +17 haproxy's stats page.
import { z } from 'zod';

export interface ClusterPorts {
  balancer: number;
  apps: number[];
  db: number[];
  galera: number[];
  ist: number[];
  sst: number[];
  s3: number;
  stats: number;
}

export const CLUSTER_SIZE = 3;

const baseSchema = z.coerce
  .number({ error: 'CLUSTER_PORT_BASE must be a port number' })
  .int()
  .min(1024, 'CLUSTER_PORT_BASE must be 1024 or above')
  .max(65535 - 20, 'CLUSTER_PORT_BASE leaves no room for the 18 ports the cluster uses')
  .refine(
    (b) => ![3306, 4444, 4567, 4568].some((p) => p >= b && p <= b + 17),
    'the cluster ports must not cover the MariaDB (3306) or Galera (4444, 4567, 4568) defaults',
  )
  .default(3440);

export function clusterPorts(base?: string | number): ClusterPorts {
  const parsed = baseSchema.safeParse(base);
  if (!parsed.success) throw new Error(`Invalid configuration:\n  CLUSTER_PORT_BASE: ${parsed.error.issues[0].message}`);
  const b = parsed.data;
  const three = (from: number) => Array.from({ length: CLUSTER_SIZE }, (_, i) => b + from + i);
  return { balancer: b, apps: three(1), db: three(4), galera: three(7), ist: three(10), sst: three(13), s3: b + 16, stats: b + 17 };
}
