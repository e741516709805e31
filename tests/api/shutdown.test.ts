// Graceful shutdown of the real HTTP server (startServer) while clients keep it busy.
import { Agent, request as httpRequest } from 'node:http';
import { describe, expect, it } from 'vitest';
import { startServer } from '../../server/index';
import { makeUser, testConfig } from '../helpers/app';
import { boxStl } from '../helpers/meshes';
import { loadSubmission, Member, sleep } from '../helpers/system';

describe('server shutdown', () => {
  it('server · shutdown begins while keep-alive clients stay busy and an upload is in flight · the upload finishes, each connection gets Connection: close once, the drain completes', async () => {
    const server = await startServer(testConfig({ PORT: '0', SHUTDOWN_TIMEOUT_S: '30', RIGSHELF_DEMO: '0' }));
    let closed = false;
    try {
      const { email, password } = await makeUser('member');
      const member = new Member(server.url);
      await member.signIn(email, password);

      // busy clients: one keep-alive connection each, one request after another
      let stop = false;
      const clients = Array.from({ length: 6 }, () => ({ agent: new Agent({ keepAlive: true, maxSockets: 1 }), log: [] as ('ok' | 'close' | 'error')[] }));
      const busy = clients.map(async (c) => {
        while (!stop) {
          const outcome = await new Promise<'ok' | 'close' | 'error'>((done) => {
            const req = httpRequest(`${server.url}/api/health`, { agent: c.agent }, (res) => {
              res.resume();
              res.on('end', () => done(res.headers.connection === 'close' ? 'close' : 'ok'));
            });
            req.on('error', () => done('error'));
            req.end();
          });
          c.log.push(outcome);
          if (outcome === 'error') await sleep(50);
        }
      });

      // an upload trickling in while shutdown begins
      let shutdown: Promise<void> | undefined;
      const boundary = '----drain-test';
      const head = Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="data"\r\n\r\n${JSON.stringify(loadSubmission('Drain test plate'))}\r\n` +
          `--${boundary}\r\nContent-Disposition: form-data; name="model"; filename="plate.stl"\r\nContent-Type: application/octet-stream\r\n\r\n`,
      );
      const stl = boxStl(30, 20, 5);
      const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
      const upload = new Promise<{ status: number; connection?: string }>((done, fail) => {
        const req = httpRequest(`${server.url}/api/parts`, {
          method: 'POST',
          agent: false,
          headers: {
            cookie: member.cookie,
            'x-csrf-token': member.token,
            'content-type': `multipart/form-data; boundary=${boundary}`,
            'content-length': String(head.length + stl.length + tail.length),
          },
        });
        req.on('response', (res) => {
          res.resume();
          done({ status: res.statusCode ?? 0, connection: res.headers.connection });
        });
        req.on('error', fail);
        void (async () => {
          req.write(head);
          const step = Math.ceil(stl.length / 8);
          for (let i = 0; i < stl.length; i += step) {
            req.write(stl.subarray(i, i + step));
            await sleep(200);
            if (i === step * 2) shutdown = server.close();
          }
          req.end(tail);
        })();
      });

      const answer = await upload;
      await shutdown;
      closed = true;
      stop = true;
      await Promise.all(busy);

      expect(answer).toEqual({ status: 201, connection: 'close' });
      for (const c of clients) {
        // after its `Connection: close` answer a client only meets a closed door
        const closeAt = c.log.indexOf('close');
        expect(c.log.filter((o) => o === 'close').length).toBeLessThanOrEqual(1);
        if (closeAt >= 0) expect(c.log.slice(closeAt + 1).every((o) => o === 'error')).toBe(true);
        expect(c.log.at(-1)).toBe('error');
        c.agent.destroy();
      }
    } finally {
      if (!closed) await server.close();
    }
  });
});
