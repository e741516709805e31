// Graceful HTTP shutdown: stop accepting, let requests in flight finish, close keep-alive
// connections, and cut whatever is still open when the drain time is up.
import type { IncomingMessage, Server, ServerResponse } from 'node:http';

export interface HttpDrain {
  /** True once shutdown has begun. */
  readonly closing: boolean;
  /** Requests whose responses have not finished yet. */
  readonly inFlight: number;
  /**
   * Stops accepting connections and resolves once every connection is closed, or once `drainMs`
   * has passed, when the remaining connections are destroyed. Resolves to true when the drain was clean.
   */
  drain(drainMs: number): Promise<boolean>;
}

export function trackConnections(server: Server): HttpDrain {
  let closing = false;
  const active = new Set<ServerResponse>();

  const markClose = (res: ServerResponse) => {
    // Node answers `Connection: close` and ends the socket after this response
    if (!res.headersSent) res.setHeader('Connection', 'close');
  };

  // first listener, before the app: the header must be set before the app can answer
  server.prependListener('request', (_req: IncomingMessage, res: ServerResponse) => {
    active.add(res);
    res.once('close', () => active.delete(res));
    if (closing) markClose(res);
  });

  return {
    get closing() {
      return closing;
    },
    get inFlight() {
      return active.size;
    },
    drain(drainMs) {
      if (!closing) {
        closing = true;
        for (const res of active) markClose(res);
      }
      return new Promise<boolean>((resolve) => {
        let done = false;
        const finish = (clean: boolean) => {
          if (done) return;
          done = true;
          clearTimeout(timer);
          clearInterval(sweeper);
          resolve(clean);
        };
        const timer = setTimeout(() => {
          server.closeAllConnections();
          finish(false);
        }, drainMs);
        // a connection that was busy when shutdown began goes idle after its `Connection: close`
        // response; Node ends it, and this catches any that linger
        const sweeper = setInterval(() => server.closeIdleConnections(), 250);
        server.close(() => finish(true));
        server.closeIdleConnections();
      });
    },
  };
}
