// haproxy in front of the app instances: round robin, a health check on /api/health every second
// (two failures take an instance out, two successes bring it back), a refused connection retried on
// another instance, and the balancer's own failures (an instance that died mid-request, no instance
// up) answered as a 503 with the app's error shape instead of haproxy's HTML page. Sessions that did
// not end normally (haproxy's termination state, status, timings) are logged to its output.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { ClusterPorts } from './ports';

const UNAVAILABLE = JSON.stringify({
  error: { code: 'instance_unavailable', message: 'The shelf could not answer this request just now. Try again in a moment.' },
});

export function haproxyConfig(dir: string, ports: ClusterPorts): string {
  const errorFile = resolve(dir, '503.http');
  const servers = ports.apps.map((p, i) => `  server app${i + 1} 127.0.0.1:${p} check`).join('\n');
  return `# written by npm run cluster; changes are overwritten
global
  maxconn 4096
  log stdout format raw local0 info

defaults
  mode http
  log global
  option httplog
  # only the sessions that did not end normally (an error status, an abort, a retry)
  option dontlog-normal
  option forwardfor
  # one connection to an instance per request. A kept-alive connection to an instance is reused by
  # other requests; when the instance closes an idle one (Node's 5 s keep-alive timeout) or dies, a
  # request sent on it gets nothing back, and for a reused connection haproxy closes the member's
  # connection without an answer so the client may retry (undici reports UND_ERR_SOCKET and does
  # not). A fresh connection per request fails as a refused connection (retried elsewhere) or a 503.
  option http-server-close
  # the request (up to a buffer, which holds the small uploads) is read before an instance is chosen:
  # an answer given early, such as the balancer's own 503, then reaches a client that is done
  # sending instead of cutting its upload off mid-body
  option http-buffer-request
  timeout connect 2s
  timeout client 60s
  timeout server 60s
  timeout http-request 30s
  timeout queue 10s
  # a health check on a busy 2-core machine can take longer than the 1 s between checks
  timeout check 3s
  # a connection that never reached an instance is tried again elsewhere; a GET or HEAD also when
  # the instance closed the connection without a byte of answer (it died), and so is a write that
  # carries an Idempotency-Key (the app answers a repeat with the first answer and adds nothing).
  # Any other write is never sent twice: the instance may have done it. Such a write, when it was
  # not the first request on the member's kept-alive connection, is answered by closing that
  # connection without a response (haproxy leaves the retry to the client, as HTTP allows for a
  # reused connection); the first request on a connection gets the 503 below
  retries 2
  retry-on conn-failure empty-response
  option redispatch 1
  errorfile 502 ${errorFile}
  errorfile 503 ${errorFile}
  errorfile 504 ${errorFile}

frontend rigshelf
  bind 127.0.0.1:${ports.balancer}
  http-request disable-l7-retry if !METH_GET !{ req.hdr(idempotency-key) -m found }
  default_backend apps

backend apps
  balance roundrobin
  option httpchk GET /api/health
  http-check expect status 200
  # no on-marked-down shutdown-sessions: an instance taken out because its database node went away
  # may still finish the requests it holds, and cutting them would turn answers into closed connections
  default-server inter 1s fastinter 500ms downinter 1s fall 2 rise 2
${servers}

listen stats
  bind 127.0.0.1:${ports.stats}
  stats enable
  stats uri /
  stats refresh 2s
`;
}

export interface Balancer {
  child: ChildProcess;
  stop(): Promise<void>;
}

export function startHaproxy(dir: string, ports: ClusterPorts, onLine: (line: string) => void): Balancer {
  mkdirSync(dir, { recursive: true });
  const body = `${UNAVAILABLE}\n`;
  writeFileSync(
    resolve(dir, '503.http'),
    `HTTP/1.1 503 Service Unavailable\r\nContent-Type: application/json\r\nCache-Control: no-store\r\nRetry-After: 2\r\nContent-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`,
  );
  const cfg = resolve(dir, 'haproxy.cfg');
  writeFileSync(cfg, haproxyConfig(dir, ports));
  // -db: stay in the foreground, so this process owns it and Ctrl-C ordering is ours
  const child = spawn('haproxy', ['-db', '-f', cfg], { stdio: ['ignore', 'pipe', 'pipe'], detached: true });
  for (const stream of [child.stdout!, child.stderr!]) {
    stream.setEncoding('utf8');
    // a soft stop reports every proxy it stopped; that is not news
    stream.on('data', (chunk: string) =>
      chunk
        .split('\n')
        .filter((l) => l && !/stopped \(cumulated conns/.test(l))
        .forEach(onLine),
    );
  }
  const exited = new Promise<void>((done) => child.once('exit', () => done()));
  return {
    child,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      // SIGUSR1: finish what is in flight, then exit
      child.kill('SIGUSR1');
      const late = setTimeout(() => child.kill('SIGTERM'), 5000);
      await exited;
      clearTimeout(late);
    },
  };
}
