// The one place that reads the server's environment. Validated at start-up: a bad value stops the
// process with a message that names the variable.
import { hostname } from 'node:os';
import { resolve } from 'node:path';
import { z } from 'zod';
import { root } from './root';

const flag = z.enum(['0', '1', 'true', 'false', 'yes', 'no']).transform((v) => v === '1' || v === 'true' || v === 'yes');

const schema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
    DB_HOST: z.string().default('127.0.0.1'),
    DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
    /**
     * External MariaDB servers (a Galera cluster's nodes), "host:port,host:port": when set the app
     * connects to the first that answers, fails over to the next when it goes away, and
     * `npm start` starts no MariaDB of its own. DB_HOST/DB_PORT are then not used.
     */
    DB_HOSTS: z
      .string()
      .optional()
      .transform((v, ctx) => {
        if (v === undefined || v.trim() === '') return undefined;
        const hosts = v
          .split(',')
          .map((h) => h.trim())
          .filter(Boolean)
          .map((h) => {
            const m = /^(\[[^\]]+\]|[^:\s]+):(\d{1,5})$/.exec(h);
            const port = m ? Number(m[2]) : 0;
            if (!m || port < 1 || port > 65535) {
              ctx.addIssue({ code: 'custom', message: `"${h}" is not host:port (e.g. 10.0.0.5:3306)` });
              return { host: '', port: 0 };
            }
            return { host: m[1].replace(/^\[|\]$/g, ''), port };
          });
        return hosts;
      }),
    /** This instance's name in job claims and leases (default hostname:pid); unique per running instance. */
    INSTANCE_ID: z.string().min(1).max(100).default(`${hostname()}:${process.pid}`),
    /** How long a claimed background job stays with its instance without a heartbeat before another takes it over. */
    JOB_LEASE_S: z.coerce.number().int().min(2).max(3600).default(30),
    DB_NAME: z
      .string()
      .regex(/^[A-Za-z0-9_]+$/, 'letters, digits and _ only')
      .default('rigshelf'),
    DB_USER: z.string().default('rigshelf'),
    DB_PASSWORD: z.string().min(1, 'DB_PASSWORD is required'),
    DB_POOL_MAX: z.coerce.number().int().min(1).default(10),
    /**
     * Longest a statement may run on the server (max_statement_time; 0 turns it off, e.g. for a long
     * migration). A database that stops answering altogether is given up on 1 s after this.
     */
    DB_QUERY_TIMEOUT_MS: z.coerce.number().int().min(0).default(5000),
    /** How long the server waits at start-up for MariaDB to accept a connection before it gives up. */
    DB_WAIT_S: z.coerce.number().min(0).max(3600).default(60),
    /** After SIGTERM/SIGINT the process exits within this many seconds, whatever is still open. */
    SHUTDOWN_TIMEOUT_S: z.coerce.number().positive().max(600).default(10),
    /** Benchmarks only: log event-loop delay figures every this many seconds (off when unset). */
    LOOP_LAG_LOG_S: z.coerce.number().positive().optional(),
    SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters'),
    /** A session ends after this long without use (each request moves it on)… */
    SESSION_MAX_AGE_HOURS: z.coerce
      .number()
      .positive()
      .default(24 * 14),
    /** …and this long after sign-in, however busy it is. */
    SESSION_ABSOLUTE_HOURS: z.coerce
      .number()
      .positive()
      .default(24 * 30),
    TRUST_PROXY: flag.optional(),
    UPLOADS_DIR: z.string().default(resolve(root, 'uploads')),
    /** Where uploaded files are kept: `local` (UPLOADS_DIR) or `s3` (an S3-compatible bucket; UPLOADS_DIR keeps only uploads in progress). */
    STORAGE: z.enum(['local', 's3'], { error: 'use local or s3' }).default('local'),
    /** The object store's address (unset: AWS S3 itself for S3_REGION). */
    S3_ENDPOINT: z.url({ protocol: /^https?$/, error: 'use an http(s) address like http://127.0.0.1:3425' }).optional(),
    S3_BUCKET: z.string().min(1).optional(),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_ACCESS_KEY_ID: z.string().min(1).optional(),
    S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
    /** Bucket in the path (http://host/bucket/key), which local fakes need; 0 for virtual-hosted names. */
    S3_FORCE_PATH_STYLE: flag.default(true),
    /**
     * The start-up sweep leaves stored files younger than this alone (another instance may be about to
     * commit their rows). Default 0 with local storage (one instance), 600 with s3.
     */
    STORAGE_SWEEP_MIN_AGE_S: z.coerce.number().min(0).optional(),
    CLIENT_DIST: z.string().default(resolve(root, 'dist')),
    /** The saved search index, loaded at start-up when it still matches the shelf. */
    SEARCH_INDEX_FILE: z.string().min(1).default(resolve(root, 'var/search-index.json')),
    RIGSHELF_DEMO: flag.optional(),
    /** Draw a shaded picture of every model in the background (on unless 0; most test apps turn it off). */
    MODEL_PICTURES: flag.default(true),
    /** Failed sign-ins per network address and window: a tenth of it free, then slower, then refused for accounts that also failed. */
    LOGIN_LIMIT_PER_IP: z.coerce.number().int().positive().default(300),
    /** Registrations and reset requests (each sends a mail) per network address and window. */
    MAIL_LIMIT_PER_IP: z.coerce.number().int().positive().default(20),
    LOGIN_LIMIT_PER_ACCOUNT: z.coerce.number().int().positive().default(8),
    LOGIN_LIMIT_WINDOW_MIN: z.coerce.number().positive().default(15),
    /** scrypt cost parameter N as a power of two (2^15 = 32 MiB per hash with r = 8). */
    PASSWORD_SCRYPT_LOG_N: z.coerce.number().int().min(10).max(20).default(15),
    SMTP_HOST: z.string().min(1).default('127.0.0.1'),
    /** 0 picks a free port (only useful with SMTP_FAKE, which the tests use). */
    SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
    SMTP_SECURE: flag.default(false),
    SMTP_USER: z.string().min(1).optional(),
    SMTP_PASS: z.string().min(1).optional(),
    MAIL_FROM: z.string().min(3).default('Rigshelf <shelf@rigshelf.test>'),
    /** Start the local fake SMTP server on SMTP_HOST:SMTP_PORT and send to it: on by default, off in production. */
    SMTP_FAKE: flag.optional(),
    /** Where people open the app; links in mails start with it. Defaults to http://127.0.0.1:PORT. */
    PUBLIC_URL: z.url({ protocol: /^https?$/, error: 'use an http(s) address like https://shelf.example.org' }).optional(),
    /** Start the local payments fake and point the SDK at it: on by default, off in production. */
    PAYMENTS_FAKE: flag.optional(),
    /** The payments service's secret API key (the fake accepts only this one). */
    PAYMENTS_SECRET_KEY: z.string().min(8, 'PAYMENTS_SECRET_KEY looks too short').default('sk_test_rigshelf_local_fake'),
    /** The secret webhook signatures are checked with (the fake signs with it). */
    PAYMENTS_WEBHOOK_SECRET: z.string().min(8, 'PAYMENTS_WEBHOOK_SECRET looks too short').default('whsec_rigshelf_local_fake'),
    /** Where the SDK sends API calls; unset with real keys means the service's own address. */
    PAYMENTS_API_HOST: z.string().min(1).optional(),
    /** 0 picks a free port (only with PAYMENTS_FAKE). */
    PAYMENTS_API_PORT: z.coerce.number().int().min(0).max(65535).optional(),
    PAYMENTS_API_PROTOCOL: z.enum(['http', 'https']).optional(),
    /** Where the fake delivers its webhook events; defaults to PUBLIC_URL/api/payments/webhook. */
    PAYMENTS_WEBHOOK_URL: z.url({ protocol: /^https?$/ }).optional(),
  })
  .superRefine((env, ctx) => {
    if (env.NODE_ENV === 'production' && env.SESSION_SECRET.length < 32) {
      ctx.addIssue({ code: 'custom', path: ['SESSION_SECRET'], message: 'use at least 32 characters in production' });
    }
    const fake = env.SMTP_FAKE ?? env.NODE_ENV !== 'production';
    if (fake && !isLoopbackHost(env.SMTP_HOST)) {
      ctx.addIssue({
        code: 'custom',
        path: ['SMTP_HOST'],
        message: 'the local fake SMTP server listens on loopback only; use 127.0.0.1, or set SMTP_FAKE=0 to send through a real host',
      });
    }
    const payFake = env.PAYMENTS_FAKE ?? env.NODE_ENV !== 'production';
    if (payFake && env.PAYMENTS_API_HOST && !isLoopbackHost(env.PAYMENTS_API_HOST)) {
      ctx.addIssue({
        code: 'custom',
        path: ['PAYMENTS_API_HOST'],
        message: 'the local payments fake listens on loopback only; use 127.0.0.1, or set PAYMENTS_FAKE=0 to talk to the real service',
      });
    }
    if (!payFake && env.PAYMENTS_API_PORT === 0) {
      ctx.addIssue({ code: 'custom', path: ['PAYMENTS_API_PORT'], message: 'give the port of the payments API (0 only works with PAYMENTS_FAKE=1)' });
    }
    // without the fake, one real key without the other is a mistake; neither means paying back is off
    const realKey = env.PAYMENTS_SECRET_KEY !== 'sk_test_rigshelf_local_fake';
    const realSecret = env.PAYMENTS_WEBHOOK_SECRET !== 'whsec_rigshelf_local_fake';
    if (!payFake && realKey !== realSecret) {
      ctx.addIssue({
        code: 'custom',
        path: [realKey ? 'PAYMENTS_WEBHOOK_SECRET' : 'PAYMENTS_SECRET_KEY'],
        message: 'set both PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET for the real payments service (or neither, and paying back is off)',
      });
    }
    if (env.STORAGE === 's3') {
      const needs = {
        S3_BUCKET: "STORAGE=s3 needs the bucket's name",
        S3_ACCESS_KEY_ID: 'STORAGE=s3 needs the access key id of an account that may read and write the bucket',
        S3_SECRET_ACCESS_KEY: 'STORAGE=s3 needs the secret access key that goes with S3_ACCESS_KEY_ID',
      } as const;
      for (const [key, message] of Object.entries(needs)) if (!env[key as keyof typeof needs]) ctx.addIssue({ code: 'custom', path: [key], message });
    }
    if (!fake && env.SMTP_PORT === 0) {
      ctx.addIssue({ code: 'custom', path: ['SMTP_PORT'], message: 'give the port of the SMTP server (0 only works with SMTP_FAKE=1)' });
    }
  });

export function isLoopbackHost(host: string): boolean {
  return host === 'localhost' || host === '::1' || /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(host);
}

export type Config = Readonly<
  Omit<z.output<typeof schema>, 'SMTP_FAKE' | 'PUBLIC_URL' | 'TRUST_PROXY' | 'PAYMENTS_FAKE' | 'PAYMENTS_WEBHOOK_URL' | 'STORAGE_SWEEP_MIN_AGE_S'> & {
    TRUST_PROXY: boolean;
    /** Things worth saying at start-up that do not stop it (e.g. production without TRUST_PROXY). */
    warnings: string[];
    isProduction: boolean;
    /** Seed the demo scenario: on by default, off in production unless RIGSHELF_DEMO=1. */
    seedDemo: boolean;
    /** Run the local fake SMTP server and send to it: on by default, off in production unless SMTP_FAKE=1. */
    SMTP_FAKE: boolean;
    /** Where people open the app, without a trailing slash (default http://127.0.0.1:PORT). */
    PUBLIC_URL: string;
    /** Run the local payments fake and point the SDK at it: on by default, off in production unless PAYMENTS_FAKE=1. */
    PAYMENTS_FAKE: boolean;
    PAYMENTS_WEBHOOK_URL: string;
    STORAGE_SWEEP_MIN_AGE_S: number;
    /** The fake, or real keys: otherwise checkout answers 503 and every webhook 400. */
    paymentsConfigured: boolean;
  }
>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  const isProduction = c.NODE_ENV === 'production';
  const warnings: string[] = [];
  if (isProduction && !c.TRUST_PROXY) {
    warnings.push(
      'TRUST_PROXY is not set: behind a TLS proxy the app sees plain HTTP and sends the session cookie without Secure. Set TRUST_PROXY=1 when a proxy terminates TLS in front of it.',
    );
  }
  return Object.freeze({
    ...c,
    TRUST_PROXY: c.TRUST_PROXY ?? false,
    warnings,
    isProduction,
    seedDemo: c.RIGSHELF_DEMO ?? !isProduction,
    SMTP_FAKE: c.SMTP_FAKE ?? !isProduction,
    PUBLIC_URL: (c.PUBLIC_URL ?? `http://127.0.0.1:${c.PORT}`).replace(/\/+$/, ''),
    PAYMENTS_FAKE: c.PAYMENTS_FAKE ?? !isProduction,
    STORAGE_SWEEP_MIN_AGE_S: c.STORAGE_SWEEP_MIN_AGE_S ?? (c.STORAGE === 's3' ? 600 : 0),
    paymentsConfigured: (c.PAYMENTS_FAKE ?? !isProduction) || c.PAYMENTS_SECRET_KEY !== 'sk_test_rigshelf_local_fake',
    PAYMENTS_WEBHOOK_URL: c.PAYMENTS_WEBHOOK_URL ?? `${(c.PUBLIC_URL ?? `http://127.0.0.1:${c.PORT}`).replace(/\/+$/, '')}/api/payments/webhook`,
  });
}
