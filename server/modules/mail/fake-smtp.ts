// A local SMTP server that accepts every mail and keeps it in memory, so development and tests send
// real SMTP without a mail provider. It listens on loopback only and never relays anything.
import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { MailboxMessage } from '@shared/types';
import { isLoopbackHost } from '../../config';

export interface FakeSmtp {
  readonly host: string;
  /** The port it listens on (the one picked when started with port 0). */
  readonly port: number;
  /** Every mail received, oldest first (the last `keep` of them). */
  messages(): MailboxMessage[];
  clear(): void;
  close(): Promise<void>;
}

export interface FakeSmtpOptions {
  host: string;
  port: number;
  /** How many messages to keep (oldest dropped first). */
  keep?: number;
  /** Largest message accepted, in bytes. */
  maxBytes?: number;
}

export async function startFakeSmtp({ host, port, keep = 500, maxBytes = 5 * 1024 * 1024 }: FakeSmtpOptions): Promise<FakeSmtp> {
  if (!isLoopbackHost(host)) {
    throw new Error(`The local fake SMTP server listens on loopback only, not on ${host}. Use 127.0.0.1, or turn it off with SMTP_FAKE=0.`);
  }
  const kept: MailboxMessage[] = [];
  let nextId = 1;

  const server = new SMTPServer({
    banner: 'Rigshelf local mail fake',
    authOptional: true,
    // loopback only: no TLS to negotiate, and any credentials are accepted
    disabledCommands: ['STARTTLS'],
    hideSTARTTLS: true,
    allowInsecureAuth: true,
    size: maxBytes,
    logger: false,
    closeTimeout: 2000,
    disableReverseLookup: true,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? 'local' });
    },
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          if (stream.sizeExceeded) {
            return callback(Object.assign(new Error(`Message is larger than ${maxBytes} bytes`), { responseCode: 552 }));
          }
          const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
          kept.push({
            id: nextId++,
            from: parsed.from?.text ?? envelopeFrom,
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            receivedAt: new Date().toISOString(),
          });
          if (kept.length > keep) kept.splice(0, kept.length - keep);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  await new Promise<void>((resolve, reject) => {
    const onError = (err: NodeJS.ErrnoException) => {
      reject(
        err.code === 'EADDRINUSE'
          ? new Error(`The local fake SMTP server cannot listen on ${host}:${port}: the port is taken. Set SMTP_PORT to a free port (0 picks one).`)
          : err,
      );
    };
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      resolve();
    });
  });
  // a client that hangs up mid-session is not our problem; keep listening
  server.on('error', (err) => console.error(`rigshelf: fake SMTP: ${err.message}`));

  const bound = (server.server.address() as AddressInfo).port;
  return {
    host,
    port: bound,
    messages: () => kept.slice(),
    clear: () => {
      kept.length = 0;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
