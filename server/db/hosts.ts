// DB_HOSTS: several MariaDB servers (the nodes of a Galera cluster). Every new pool connection goes
// to the host in use while it accepts connections; when it stops (refused, unreachable, silent, or a
// Galera node that is not ready), the next host in the list that answers takes over. Connections
// already open to a host that went away fail once (a 503 for that request) and leave the pool; the
// ones that replace them go to the next host. One host at a time, so an instance's writes never
// race each other on two nodes (fewer certification conflicts) and it reads what it wrote.
import { connect } from 'node:net';
import type { Sequelize } from 'sequelize';

export interface DbHost {
  host: string;
  port: number;
}

/** After a host fails, it is skipped for this long unless no other host answers. */
const DOWN_MS = 5000;
const PROBE_MS = 1000;

/** True when a TCP connection to host:port opens within `timeoutMs`. */
export function reachable({ host, port }: DbHost, timeoutMs = PROBE_MS): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = connect({ host, port });
    const done = (ok: boolean) => {
      socket.destroy();
      resolve(ok);
    };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once('connect', () => done(true));
    socket.once('error', () => done(false));
  });
}

export interface HostChooser {
  readonly hosts: readonly DbHost[];
  /** The host new connections go to now. */
  current(): DbHost;
  /** The first host (from the one in use, in list order) that accepts a TCP connection. */
  pick(): Promise<DbHost>;
  /** A connection to `host` failed after it opened (e.g. a Galera node not ready): try others first. */
  markDown(host: DbHost): void;
}

export function createHostChooser(hosts: readonly DbHost[], probe: (h: DbHost) => Promise<boolean> = reachable): HostChooser {
  if (!hosts.length) throw new Error('DB_HOSTS lists no host');
  let index = 0;
  const downUntil = new Map<number, number>();
  return {
    hosts,
    current: () => hosts[index],
    async pick() {
      const order = hosts.map((_, i) => (index + i) % hosts.length);
      const now = Date.now();
      // hosts marked down recently go last, but are still tried when nothing else answers
      const ranked = [...order.filter((i) => (downUntil.get(i) ?? 0) <= now), ...order.filter((i) => (downUntil.get(i) ?? 0) > now)];
      for (const i of ranked) {
        if (await probe(hosts[i])) {
          if (i !== index) console.log(`rigshelf: database connections now go to ${hosts[i].host}:${hosts[i].port}`);
          index = i;
          return hosts[i];
        }
        downUntil.set(i, Date.now() + DOWN_MS);
      }
      return hosts[index];
    },
    markDown(host) {
      const i = hosts.findIndex((h) => h.host === host.host && h.port === host.port);
      if (i >= 0) downUntil.set(i, Date.now() + DOWN_MS);
    },
  };
}

interface ConnectionConfig {
  host?: string;
  port?: number | string;
}
interface RawConnection {
  query(sql: string): Promise<unknown>;
}

/**
 * Points each new connection of `sequelize` at the chooser's host (Sequelize's beforeConnect hook),
 * and refuses a connection to a Galera node that says it is not ready (wsrep_on but not wsrep_ready),
 * so the pool tries the next host. A server not running Galera (wsrep_on OFF or absent) is taken as it is.
 */
export function useHosts(sequelize: Sequelize, chooser: HostChooser): void {
  sequelize.addHook('beforeConnect', async (config: ConnectionConfig) => {
    const host = await chooser.pick();
    config.host = host.host;
    config.port = host.port;
  });
  sequelize.addHook('afterConnect', async (connection: unknown, config: ConnectionConfig) => {
    const raw = connection as RawConnection;
    // a server built with Galera support but not running it says wsrep_on OFF, and wsrep_ready OFF too
    const on = (await raw.query("SHOW GLOBAL VARIABLES LIKE 'wsrep_on'")) as { Value?: string }[];
    if (on[0]?.Value !== 'ON') return;
    const ready = (await raw.query("SHOW GLOBAL STATUS LIKE 'wsrep_ready'")) as { Value?: string }[];
    if (ready[0]?.Value !== 'ON') {
      chooser.markDown({ host: String(config.host), port: Number(config.port) });
      await (connection as { end?(): Promise<void> }).end?.().catch(() => undefined);
      throw new Error(`the Galera node at ${config.host}:${config.port} is not ready (wsrep_ready OFF)`);
    }
  });
}
