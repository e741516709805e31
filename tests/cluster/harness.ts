// The cluster fault run (`npm run test:cluster`): starts the loopback cluster of `npm run cluster`
// in a scratch folder, sends a mixed load of signed-in members through haproxy (search, part pages,
// ratings, set reports, kit items, small STL uploads with photos), kills one app instance, then one
// Galera node, brings both back during the load, and then checks the shelf, the object store, the
// photo jobs, every instance's search, the sessions, the error answers and the cluster's state.
import { randomUUID } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { Cluster } from '../../server/scripts/cluster/cluster';
import { clusterPorts } from '../../server/scripts/cluster/ports';
import { boxStl } from '../helpers/meshes';
import {
  countByRoute,
  databaseOrphans,
  percentile,
  pick,
  ratingProblems,
  Recorder,
  rowsOf,
  SEARCH_WORDS,
  submissionProblems,
  type RatingAttempt,
  type Sample,
} from '../helpers/mixed-load';
import { plainPng } from '../helpers/photos';
import { addMembers, loadSubmission, Member, portOpen, publishedParts, sleep, waitFor } from '../helpers/system';

export interface ClusterRunOptions {
  members: number;
  durationMs: number;
  /** When each fault happens, as a fraction of the load's duration. */
  killInstanceAt: number;
  killNodeAt: number;
  restartInstanceAt: number;
  restartNodeAt: number;
  /** With STORAGE=s3: when the S3 fake is stopped (a fraction of the load's duration) and for how long; 0 ms skips it. */
  storeAwayAt: number;
  storeAwayMs: number;
  /** Parts approved after the load, to time every instance's search. */
  searchProbes: number;
  /** The stated bound for every instance's search to find a newly published part. */
  searchBoundMs: number;
  /** Load that goes on after both are back, for the "after" figures. */
  afterMs: number;
  storage: 's3' | 'local';
  /** The instances run the compiled server (default) or the sources through tsx. */
  server?: 'compiled' | 'tsx';
  portBase?: string;
  log?: (line: string) => void;
}

export const LONG_FORM: ClusterRunOptions = {
  members: 16,
  durationMs: 150_000,
  killInstanceAt: 0.2,
  killNodeAt: 0.35,
  restartInstanceAt: 0.5,
  restartNodeAt: 0.6,
  storeAwayAt: 0.7,
  storeAwayMs: 15_000,
  searchProbes: 3,
  searchBoundMs: 5_000,
  afterMs: 30_000,
  storage: 's3',
};

export const SHORT_FORM: ClusterRunOptions = {
  ...LONG_FORM,
  members: 6,
  durationMs: 60_000,
  searchProbes: 1,
  afterMs: 15_000,
};

/** A form sized for CI: the same faults in the same order and every check, with less load and a shorter window. */
export const CI_FORM: ClusterRunOptions = {
  ...LONG_FORM,
  members: 4,
  durationMs: 40_000,
  storeAwayMs: 5_000,
  searchProbes: 1,
  afterMs: 8_000,
};

interface Event {
  name: string;
  at: number;
}

export interface PhaseFigures {
  name: string;
  fromS: number;
  toS: number;
  requests: number;
  errors: Record<string, number>;
  p50: number;
  p95: number;
}

export interface ClusterSummary {
  options: ClusterRunOptions;
  requests: number;
  byRoute: Record<string, { count: number; statuses: Record<string, number> }>;
  errorsByStatus: Record<string, number>;
  phases: PhaseFigures[];
  recovery: Record<string, number>;
  submissions: { acknowledged: number; missing: string[]; duplicated: string[] };
  reports: { acknowledged: number; missing: string[]; duplicated: string[] };
  kitItems: { acknowledged: number; problems: string[] };
  ratings: { acknowledged: number; problems: string[] };
  dbOrphans: Record<string, number>;
  objects: { listed: number; missing: string[]; orphans: string[]; leftForSweep: number; source: string };
  /**
   * `ranTwice`: more tries than one plus the holders that died holding the photo (a try cut off by
   * its instance's death is counted in both processing_attempts and lease_expiries) with no failed
   * try in the instances' logs; `retriedAfterError`: the same, where an instance logged that a try of
   * that photo failed (the database refused its outcome, say) and the photo was cleaned again;
   * `takenOver`: photos another instance took over once a dead holder's lease ran out.
   */
  photos: { total: number; notReady: number; ranTwice: number; retriedAfterError: number; takenOver: number; failed: number };
  search: { instance: string; ms: number | null }[];
  sessions: { members: number; survived: number };
  unclean: string[];
  /** Answers that took longer than SLOW_MS. */
  slow: number;
  /** The instances' log lines about failures (500 refs, uncaught errors), for reading the 5xx. */
  instanceErrors: string[];
  /** Photos still waiting after the wait: their rows and the instances' lines about them and their job loops. */
  stuckPhotos: string[];
  /** haproxy's log of the sessions that did not end normally (termination state, status, timings). */
  balancerLog: string[];
  galera: { node: string; size: number; state: string }[];
  /** While the S3 fake was stopped: the requests that need no file (search, part pages, ratings, kit items) and the rest. */
  storeAway: {
    ms: number;
    fileFree: { requests: number; failed: number };
    uploads: { requests: number; statuses: Record<string, { count: number; statuses: Record<string, number> }> };
  } | null;
  durationMs: number;
}

/** Routes of the load that touch no stored file: they should not notice the object store going away. */
const FILE_FREE_ROUTES = new Set(['search', 'part', 'rate', 'kit-item']);

const runId = () => Date.now().toString(36);

/**
 * How long a load request may take before it counts as hung: past haproxy's `timeout server` (60 s),
 * after which the balancer itself answers a 503.
 */
const WAIT_MS = 65_000;
/** Requests slower than this are counted (not failed): on a shared 2-core machine the tail is long. */
const SLOW_MS = 30_000;

/** A word of letters only that nothing on the shelf shares, for finding one part by search. */
function markWord(n: number): string {
  let word = '';
  for (let i = 0; i < 9; i++) word += String.fromCharCode(97 + Math.floor(Math.random() * 26));
  return `${word}${String.fromCharCode(97 + (n % 26))}`;
}

/** The part of @aws-sdk/client-s3 the run uses to list the bucket. */
interface S3Sdk {
  S3Client: new (config: object) => {
    send(command: object): Promise<{ Contents?: { Key?: string }[]; IsTruncated?: boolean; NextContinuationToken?: string }>;
    destroy(): void;
  };
  ListObjectsV2Command: new (input: { Bucket: string; ContinuationToken?: string }) => object;
}

/** Lists every object the store holds: the bucket through the S3 API, or the shared folder. */
async function listObjects(cluster: Cluster): Promise<{ keys: string[]; source: string }> {
  if (cluster.options.storage === 'local') {
    const root = join(cluster.options.dir, 'files');
    const keys: string[] = [];
    const walk = (dir: string, prefix: string) => {
      if (!existsSync(dir)) return;
      for (const name of readdirSync(dir)) {
        const full = join(dir, name);
        if (statSync(full).isDirectory()) walk(full, `${prefix}${name}/`);
        else keys.push(`${prefix}${name}`);
      }
    };
    walk(root, '');
    // the upload scratch folder is not object storage
    return { keys: keys.filter((k) => !k.startsWith('tmp/')), source: root };
  }
  // the SDK the storage driver uses; named through a variable so this file compiles without it
  const sdkName = '@aws-sdk/client-s3';
  const sdk = (await import(sdkName)) as S3Sdk;
  const env = cluster.s3Env;
  const client = new sdk.S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
  });
  const keys: string[] = [];
  let token: string | undefined;
  try {
    do {
      const page = await client.send(new sdk.ListObjectsV2Command({ Bucket: env.S3_BUCKET, ContinuationToken: token }));
      for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key);
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
  } finally {
    client.destroy();
  }
  return { keys, source: `${env.S3_ENDPOINT}/${env.S3_BUCKET}` };
}

/** A 5xx answer is clean when it is a 503 whose JSON says what happened, with no stack trace in it. */
export function uncleanError(s: Sample): string | null {
  if (s.status === 0) return `${s.route}: no answer (${s.error ?? 'unknown'} after ${(s.ms / 1000).toFixed(1)} s)`;
  if (s.status < 500) return null;
  if (s.status !== 503) return `${s.route}: ${s.status} ${s.body?.slice(0, 120) ?? ''}`;
  try {
    const parsed = JSON.parse(s.body ?? '') as { error?: { message?: string } };
    if (!parsed.error?.message) return `${s.route}: 503 without a message`;
    if (/\n\s+at\s|Error:/.test(s.body ?? '')) return `${s.route}: 503 with a stack trace`;
    return null;
  } catch {
    return `${s.route}: 503 that is not JSON: ${s.body?.slice(0, 80)}`;
  }
}

export async function runClusterFaults(options: ClusterRunOptions): Promise<ClusterSummary> {
  const log = options.log ?? ((line: string) => console.log(`cluster-run: ${line}`));
  const started = Date.now();
  const ports = clusterPorts(options.portBase);
  for (const p of [ports.balancer, ...ports.apps, ...ports.db, ports.s3]) {
    if (await portOpen(p)) throw new Error(`port ${p} is in use: stop \`npm run cluster\` (or whatever listens there) before the fault run`);
  }
  const dir = mkdtempSync(join(tmpdir(), 'rigshelf-cluster-run-'));
  const balancerLines: { at: number; text: string }[] = [];
  const cluster = new Cluster({
    dir,
    ports,
    storage: options.storage,
    sst: 'mariabackup',
    demo: false,
    server: options.server,
    // pictures cost seconds of CPU each; sign-in cost is not what this run measures
    instanceEnv: { MODEL_PICTURES: '0', PASSWORD_SCRYPT_LOG_N: '12', LOGIN_LIMIT_PER_IP: '1000000', LOGIN_LIMIT_PER_ACCOUNT: '1000000' },
    log: (line) => {
      // haproxy prints a state change twice: as a [WARNING] on stderr and in its log
      if (line.startsWith('haproxy: ') && !/^haproxy: \[(WARNING|ALERT|NOTICE)\]/.test(line)) balancerLines.push({ at: Date.now(), text: line.slice(9) });
      log(line);
    },
  });
  const run = runId();
  const recorder = new Recorder();
  const events: Event[] = [];
  const recovery: Record<string, number> = {};
  const submissions: { title: string; status: number; word: string }[] = [];
  const reports: { title: string; status: number }[] = [];
  const ratings: RatingAttempt[] = [];
  const kitAttempts = new Map<number, { acked: number; unclear: number }>();
  let stopLoad = false;
  // Ctrl-C or a CI job's SIGTERM still stops everything this run started (nodes, haproxy, instances)
  let stopping: Promise<void> | null = null;
  const onSignal = (signal: NodeJS.Signals) => {
    stopLoad = true;
    log(`${signal} received; stopping the cluster`);
    stopping ??= cluster
      .stop()
      .catch((err) => log(`stopping the cluster: ${String(err)}`))
      .finally(() => {
        if (!process.env.CLUSTER_KEEP) rmSync(dir, { recursive: true, force: true });
        process.exit(130);
      });
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
  // the S3 fake runs in this process: an error it throws outside a request still stops the cluster
  const onCrash = (err: unknown) => {
    log(`uncaught error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
    onSignal('SIGTERM');
  };
  process.on('uncaughtException', onCrash);

  try {
    await cluster.start();
    const node1 = cluster.galera.nodes[0].db;
    const sql = rowsOf((q) => node1.sql(q));
    const password = 'cluster load password 1';
    const emails = await addMembers(node1, `cluster-${run}`, options.members, password);
    const [modEmail] = await addMembers(node1, `cluster-mod-${run}`, 1, password);
    await node1.sql(`UPDATE rigshelf.users SET role = 'moderator' WHERE email = '${modEmail}'`);
    const stl = boxStl(40, 30, 6);
    const png = await plainPng(48, 32);
    const { ids: partIds } = await publishedParts(node1, cluster.url, 5, stl);
    const members: { email: string; client: Member; kitId: number }[] = [];
    for (const email of emails) {
      const client = new Member(cluster.url);
      await client.signIn(email, password);
      const kit = await client.request('POST', '/api/kits', { name: `Cluster kit ${email.split('@')[0]}` });
      if (kit.status !== 201) throw new Error(`creating a kit: ${kit.status} ${await kit.text()}`);
      const kitId = ((await kit.json()) as { id: number }).id;
      kitAttempts.set(kitId, { acked: 0, unclear: 0 });
      members.push({ email, client, kitId });
    }
    const moderator = new Member(cluster.url);
    await moderator.signIn(modEmail, password);
    log(`${members.length} members signed in through haproxy; ${partIds.length} published parts; load for ${options.durationMs / 1000} s`);

    let counter = 0;
    // every write of the load carries an Idempotency-Key: haproxy may then send it again on another
    // instance when its instance died before answering, and the app files it once
    const onceKey = () => ({ 'Idempotency-Key': randomUUID() });
    const upload = (form: FormData, name: string) => form.append('photo', new Blob([new Uint8Array(png)], { type: 'image/png' }), name);
    async function submit(c: Member) {
      counter += 1;
      const word = markWord(counter);
      const title = `Cluster plate ${run} ${counter} ${word}`;
      const form = new FormData();
      form.append('data', JSON.stringify(loadSubmission(title)));
      form.append('model', new Blob([new Uint8Array(stl)]), 'plate.stl');
      if (counter % 2 === 0) upload(form, 'plate.png');
      const s = await recorder.timed('submit', () => c.request('POST', '/api/parts', form, WAIT_MS, onceKey()));
      submissions.push({ title, status: s.status, word });
    }
    async function report(c: Member) {
      counter += 1;
      const production = `Cluster shoot ${run} ${counter}`;
      const form = new FormData();
      form.append('data', JSON.stringify({ production, daysInUse: 3, material: 'PETG', outcome: 'held-up', conditions: [] }));
      if (counter % 2 === 0) upload(form, 'on-set.png');
      const s = await recorder.timed('report', () => c.request('POST', `/api/parts/${pick(partIds)}/reports`, form, WAIT_MS, onceKey()));
      reports.push({ title: production, status: s.status });
    }
    async function kitItem(m: (typeof members)[number]) {
      const s = await recorder.timed('kit-item', () =>
        m.client.request('POST', `/api/kits/${m.kitId}/items`, { partId: pick(partIds), quantity: 2 }, WAIT_MS, onceKey()),
      );
      const entry = kitAttempts.get(m.kitId)!;
      if (s.status === 201 || s.status === 200) entry.acked += 1;
      else if (s.status <= 0 || s.status >= 500) entry.unclear += 1;
    }
    async function member(m: (typeof members)[number]) {
      while (!stopLoad) {
        const roll = Math.random();
        const c = m.client;
        if (roll < 0.3) await recorder.timed('search', () => c.request('GET', `/api/search?q=${encodeURIComponent(pick(SEARCH_WORDS))}`, undefined, WAIT_MS));
        else if (roll < 0.55) await recorder.timed('part', () => c.request('GET', `/api/parts/${pick(partIds)}`, undefined, WAIT_MS));
        else if (roll < 0.65) {
          const partId = pick(partIds);
          const stars = 1 + Math.floor(Math.random() * 5);
          const s = await recorder.timed('rate', () => c.request('POST', `/api/parts/${partId}/ratings`, { stars }, WAIT_MS, onceKey()));
          ratings.push({ member: m.email, partId, stars, status: s.status, at: s.at });
        } else if (roll < 0.75) await report(c);
        else if (roll < 0.87) await kitItem(m);
        else await submit(c);
        await sleep(150 + Math.random() * 200);
      }
    }

    const t0 = Date.now();
    const at = (fraction: number) => sleep(Math.max(0, t0 + options.durationMs * fraction - Date.now()));
    const mark = (name: string) => {
      events.push({ name, at: Date.now() });
      log(name);
    };
    const load = members.map((m) => member(m));
    const victim = cluster.instances[1];
    const node = cluster.galera.nodes[2];
    const faults = (async () => {
      await at(options.killInstanceAt);
      mark(`${victim.name} killed (SIGKILL)`);
      await victim.kill();
      await at(options.killNodeAt);
      mark(`Galera ${node.name} killed (SIGKILL)`);
      const pid = node.pid();
      if (pid) process.kill(pid, 'SIGKILL');
      await waitFor(() => node.pid() === null, 10_000);
      await at(options.restartInstanceAt);
      mark(`${victim.name} restarting`);
      const restartAt = Date.now();
      await victim.start();
      // back in service once haproxy's health check takes it in again
      await waitFor(async () => (await haproxyState(ports.stats, victim.name)) === 'UP', 60_000, 200);
      recovery[`${victim.name}: restart to back in haproxy`] = Date.now() - restartAt;
      mark(`${victim.name} back in haproxy`);
      await at(options.restartNodeAt);
      mark(`Galera ${node.name} restarting`);
      const nodeAt = Date.now();
      await node.start(false);
      recovery[`${node.name}: restart to Synced`] = Date.now() - nodeAt;
      mark(`Galera ${node.name} Synced`);
      if (options.storage !== 's3' || options.storeAwayMs <= 0) return;
      await at(options.storeAwayAt);
      mark('S3 fake stopped');
      await cluster.stopObjectStore();
      await sleep(options.storeAwayMs);
      mark('S3 fake restarted');
      await cluster.startObjectStore();
    })();
    await Promise.all([faults, at(1)]);
    await sleep(options.afterMs);
    stopLoad = true;
    await Promise.all(load);
    mark('load stopped');

    // ---- search: approve fresh parts through the balancer; time how long each instance takes to find them
    const fresh = submissions.filter((s) => s.status === 201).slice(0, options.searchProbes);
    const searchFigures: ClusterSummary['search'] = [];
    for (const probe of fresh) {
      const [[partId]] = await sql(`SELECT part_id FROM rigshelf.part_revisions WHERE title = '${probe.title}'`);
      const approved = await moderator.request('POST', `/api/review/${partId}/approve`, {});
      if (approved.status !== 200) throw new Error(`approving ${probe.title}: ${approved.status} ${await approved.text()}`);
      const from = Date.now();
      await Promise.all(
        cluster.instances.map(async (inst) => {
          const q = `/api/search?q=${encodeURIComponent(probe.word)}`;
          const found = await waitFor(
            async () => {
              const res = await fetch(inst.url + q, { signal: AbortSignal.timeout(5000) }).catch(() => null);
              if (!res || res.status !== 200) return false;
              const body = (await res.json()) as { results: { id: number }[] };
              return body.results.some((r) => r.id === Number(partId));
            },
            // waited for well past the bound, so a late instance is measured rather than written off
            Math.max(options.searchBoundMs * 12, 60_000),
            100,
          );
          searchFigures.push({ instance: inst.name, ms: found ? Date.now() - from : null });
        }),
      );
    }

    // ---- photo jobs settle (each is cleaned once, by whichever instance claims it)
    const pendingPhotos = async () =>
      Number(
        (
          await sql(
            "SELECT (SELECT COUNT(*) FROM rigshelf.part_files WHERE kind = 'photo' AND processing = 'pending') + (SELECT COUNT(*) FROM rigshelf.report_photos WHERE processing = 'pending')",
          )
        )[0][0],
      );
    await waitFor(async () => (await pendingPhotos()) === 0, 90_000, 500);
    // a photo still waiting: its row and what the instances said about it and their job loops
    const stuckPhotos: string[] = [];
    for (const table of ['part_files', 'report_photos']) {
      for (const [name, attempts, expiries, holder, lease, created, now] of await sql(
        `SELECT stored_name, processing_attempts, lease_expiries, IFNULL(claimed_by, '-'), IFNULL(lease_until, '-'), created_at, NOW(3) FROM rigshelf.${table} WHERE processing = 'pending'`,
      )) {
        stuckPhotos.push(
          `${table} ${name}: attempts ${attempts}, lease expiries ${expiries}, held by ${holder} until ${lease}, created ${created}, now ${now}`,
        );
        for (const inst of cluster.instances) {
          for (const l of inst.lines.filter((x) => x.text.includes(name) || /background job loop|startup-sweep/.test(x.text))) {
            stuckPhotos.push(`  ${inst.name} ${((l.at - t0) / 1000).toFixed(1)} s: ${l.text.slice(0, 200)}`);
          }
        }
      }
    }

    // ---- checks
    const submitted = await submissionProblems(sql, 'rigshelf', `Cluster plate ${run} %`, submissions);
    const storedReports = new Map<string, number>();
    for (const [production, n] of await sql(
      `SELECT production, COUNT(*) FROM rigshelf.set_reports WHERE production LIKE 'Cluster shoot ${run} %' GROUP BY production`,
    )) {
      storedReports.set(production, Number(n));
    }
    const ackedReports = reports.filter((r) => r.status === 201);
    const kitProblems: string[] = [];
    for (const [kitId, a] of kitAttempts) {
      const [[rows]] = await sql(`SELECT COUNT(*) FROM rigshelf.kit_items WHERE kit_id = ${kitId}`);
      if (Number(rows) < a.acked) kitProblems.push(`kit ${kitId}: ${rows} item(s) stored, ${a.acked} acknowledged`);
      if (Number(rows) > a.acked + a.unclear) kitProblems.push(`kit ${kitId}: ${rows} item(s) stored, at most ${a.acked + a.unclear} sent`);
    }

    const files = await sql('SELECT kind, stored_name, processing, processing_attempts, lease_expiries FROM rigshelf.part_files');
    const photoRows = await sql('SELECT stored_name, processing, processing_attempts, lease_expiries FROM rigshelf.report_photos');
    const expected = new Set<string>();
    const pendingNames = new Set<string>();
    const photos = { total: 0, notReady: 0, ranTwice: 0, retriedAfterError: 0, takenOver: 0, failed: 0 };
    // "photo <name> could not be cleaned: …" or "photo <name>: <error>" (server/modules/files/photo-jobs.ts)
    const failedTry = new Set(cluster.instances.flatMap((inst) => inst.lines.map((l) => /^photo (\S+?)(?::| could not be cleaned)/.exec(l.text)?.[1] ?? '')));
    const expectPhoto = (name: string, processing: string, attempts: string, expiries: string) => {
      photos.total += 1;
      if (processing === 'ready') {
        expected.add(`${name}-display.jpg`);
        expected.add(`${name}-thumb.jpg`);
      } else {
        pendingNames.add(name);
        if (processing === 'failed') photos.failed += 1;
        else photos.notReady += 1;
      }
      if (Number(attempts) > 1 + Number(expiries)) {
        if (failedTry.has(name)) photos.retriedAfterError += 1;
        else photos.ranTwice += 1;
      }
      if (Number(expiries) > 0) photos.takenOver += 1;
    };
    for (const [kind, name, processing, attempts, expiries] of files) {
      if (kind === 'photo') expectPhoto(name, processing, attempts, expiries);
      else expected.add(name);
    }
    for (const [name, processing, attempts, expiries] of photoRows) expectPhoto(name, processing, attempts, expiries);
    const unclaimed = (keys: string[]) =>
      keys.filter((k) => {
        const n = basename(k);
        const base = n.replace(/-(display|thumb)\.jpg$/, '');
        return !expected.has(n) && !pendingNames.has(n) && !pendingNames.has(base);
      });
    let listed = await listObjects(cluster);
    const names = new Set(listed.keys.map((k) => basename(k)));
    const missing = [...expected].filter((n) => !names.has(n));
    // An object whose commit went unanswered (its instance died) is left on purpose: the row may have
    // landed. The start-up sweep settles such objects once they are old enough; with other instances
    // up it leaves everything from the last hour alone (server/index.ts), so stop them all and start
    // app1 alone with no minimum age, as an operator would after the faults, and look again. app1
    // alone then answers the session check below through haproxy.
    const leftForSweep = unclaimed(listed.keys).length;
    if (leftForSweep) {
      log(`${leftForSweep} object(s) without rows; restarting app1 alone so its start-up sweep settles them`);
      await Promise.all(cluster.instances.map((i) => i.stop()));
      await cluster.instances[0].start({ STORAGE_SWEEP_MIN_AGE_S: '0' });
      await waitFor(async () => (await haproxyState(ports.stats, cluster.instances[0].name)) === 'UP', 30_000, 200);
      listed = await listObjects(cluster);
    }
    const orphans = unclaimed(listed.keys);

    const sessions = { members: members.length, survived: 0 };
    for (const m of members) {
      const me = await m.client.request('GET', '/api/auth/me').catch(() => null);
      if (me?.status === 200) sessions.survived += 1;
    }

    const galera = await Promise.all(
      cluster.galera.nodes.map(async (n) => {
        const s = await n.status();
        return { node: n.name, size: s?.size ?? 0, state: s?.state ?? 'down' };
      }),
    );

    const samples = recorder.samples.filter((s) => s.at >= t0);
    const bounds = [{ name: 'before the faults', at: t0 }, ...events, { name: 'end', at: Date.now() }];
    const phases: PhaseFigures[] = [];
    for (let i = 0; i < bounds.length - 1; i++) {
      const inside = samples.filter((s) => s.at >= bounds[i].at && s.at < bounds[i + 1].at);
      if (!inside.length) continue;
      const errors: Record<string, number> = {};
      for (const s of inside)
        if (s.status <= 0 || s.status >= 400) errors[String(s.status || 'no answer')] = (errors[String(s.status || 'no answer')] ?? 0) + 1;
      const ms = inside.map((s) => s.ms);
      phases.push({
        name: i === 0 ? 'before the faults' : `after "${bounds[i].name}"`,
        fromS: (bounds[i].at - t0) / 1000,
        toS: (bounds[i + 1].at - t0) / 1000,
        requests: inside.length,
        errors,
        p50: percentile(ms, 50),
        p95: percentile(ms, 95),
      });
    }
    const errorsByStatus: Record<string, number> = {};
    for (const s of samples) {
      const key = s.status === 0 ? 'no answer' : String(s.status);
      if (s.status <= 0 || s.status >= 400) errorsByStatus[key] = (errorsByStatus[key] ?? 0) + 1;
    }
    const firstFault = events[0]?.at ?? t0;
    const unclean = samples
      .map((s) => ({ s, problem: uncleanError(s) }))
      .filter((u): u is { s: Sample; problem: string } => u.problem !== null)
      .map((u) => `${u.problem} (sent at ${((u.s.at - t0) / 1000).toFixed(1)} s, ${u.s.at < firstFault ? 'before' : 'after'} the first fault)`);
    const sessionsRecovered = events.find((e) => e.name.endsWith('killed (SIGKILL)'));
    if (sessionsRecovered) {
      // time from the first fault until requests succeed again without a 5xx for 5 s in a row
      const after = samples.filter((s) => s.at >= sessionsRecovered.at).sort((a, b) => a.at - b.at);
      let lastBad = sessionsRecovered.at;
      for (const s of after) if (s.status <= 0 || s.status >= 500) lastBad = s.at + s.ms;
      recovery['last 5xx after the first fault'] = lastBad - sessionsRecovered.at;
    }

    const storeStopped = events.find((e) => e.name === 'S3 fake stopped');
    const storeBack = events.find((e) => e.name === 'S3 fake restarted');
    let storeAway: ClusterSummary['storeAway'] = null;
    if (storeStopped && storeBack) {
      const during = samples.filter((x) => x.at >= storeStopped.at && x.at < storeBack.at);
      const fileFree = during.filter((x) => FILE_FREE_ROUTES.has(x.route));
      const firstUpload = samples.filter((x) => x.route === 'submit' && x.status === 201 && x.at >= storeBack.at).sort((a, b) => a.at - b.at)[0];
      if (firstUpload) recovery['S3 fake restart to the first stored upload'] = firstUpload.at + firstUpload.ms - storeBack.at;
      storeAway = {
        ms: storeBack.at - storeStopped.at,
        fileFree: { requests: fileFree.length, failed: fileFree.filter((x) => x.status <= 0 || x.status >= 500).length },
        uploads: { requests: during.length - fileFree.length, statuses: countByRoute(during.filter((x) => !FILE_FREE_ROUTES.has(x.route))) },
      };
    }

    return {
      options,
      requests: samples.length,
      byRoute: countByRoute(samples),
      errorsByStatus,
      phases,
      recovery,
      submissions: submitted,
      reports: {
        acknowledged: ackedReports.length,
        missing: ackedReports.filter((r) => !storedReports.has(r.title)).map((r) => r.title),
        duplicated: [...storedReports].filter(([, n]) => n > 1).map(([t]) => t),
      },
      kitItems: { acknowledged: [...kitAttempts.values()].reduce((n, a) => n + a.acked, 0), problems: kitProblems },
      ratings: {
        acknowledged: ratings.filter((r) => r.status === 200 || r.status === 201).length,
        problems: await ratingProblems(sql, 'rigshelf', `cluster-${run}-%`, ratings),
      },
      dbOrphans: await databaseOrphans(sql, 'rigshelf'),
      objects: { listed: listed.keys.length, missing, orphans, leftForSweep, source: listed.source },
      photos,
      search: searchFigures,
      sessions,
      unclean,
      slow: samples.filter((x) => x.ms > SLOW_MS).length,
      stuckPhotos,
      instanceErrors: cluster.instances.flatMap((inst) =>
        inst.lines
          .filter((l) => l.stream === 'err' && /\bref [0-9a-f]{6,}|Error\b/.test(l.text))
          .map((l) => `${inst.name} ${((l.at - t0) / 1000).toFixed(1)} s: ${l.text.slice(0, 300)}`),
      ),
      balancerLog: balancerLines.map((l) => `${((l.at - t0) / 1000).toFixed(1)} s: ${l.text.slice(0, 300)}`),
      galera,
      storeAway,
      durationMs: Date.now() - started,
    };
  } finally {
    stopLoad = true;
    // a signal's stop exits the process once the cluster is down; what failed meanwhile is its doing
    if (stopping) await stopping;
    else {
      await cluster.stop().catch((err) => log(`stopping the cluster: ${String(err)}`));
      if (!process.env.CLUSTER_KEEP) rmSync(dir, { recursive: true, force: true });
    }
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    process.off('uncaughtException', onCrash);
  }
}

/** An instance's state in haproxy's stats (UP, DOWN, …), read from its CSV export. */
async function haproxyState(statsPort: number, server: string): Promise<string | null> {
  const res = await fetch(`http://127.0.0.1:${statsPort}/;csv`, { signal: AbortSignal.timeout(2000) }).catch(() => null);
  if (!res) return null;
  const line = (await res.text()).split('\n').find((l) => l.startsWith(`apps,${server},`));
  return line?.split(',')[17] ?? null;
}

export function verdict(s: ClusterSummary): string[] {
  const p: string[] = [];
  if (s.submissions.missing.length) p.push(`${s.submissions.missing.length} acknowledged submission(s) missing`);
  if (s.submissions.duplicated.length) p.push(`${s.submissions.duplicated.length} submission(s) stored more than once`);
  if (s.reports.missing.length) p.push(`${s.reports.missing.length} acknowledged set report(s) missing`);
  if (s.reports.duplicated.length) p.push(`${s.reports.duplicated.length} set report(s) stored more than once`);
  if (s.kitItems.problems.length) p.push(`kit items: ${s.kitItems.problems.slice(0, 3).join('; ')}`);
  if (s.ratings.problems.length) p.push(`ratings: ${s.ratings.problems.slice(0, 3).join('; ')}`);
  for (const [name, n] of Object.entries(s.dbOrphans)) if (n) p.push(`database: ${n} × ${name}`);
  if (s.objects.missing.length)
    p.push(`object store: ${s.objects.missing.length} row(s) without their object, e.g. ${s.objects.missing.slice(0, 3).join(', ')}`);
  if (s.objects.orphans.length) p.push(`object store: ${s.objects.orphans.length} object(s) without a row, e.g. ${s.objects.orphans.slice(0, 3).join(', ')}`);
  if (s.photos.notReady || s.photos.failed) p.push(`photos: ${s.photos.notReady} still waiting, ${s.photos.failed} failed`);
  if (s.photos.ranTwice) p.push(`photos: ${s.photos.ranTwice} cleaned more than once`);
  if (s.photos.retriedAfterError) p.push(`photos: ${s.photos.retriedAfterError} cleaned again after a failed try`);
  for (const f of s.search)
    if (f.ms === null || f.ms > s.options.searchBoundMs)
      p.push(`search on ${f.instance}: ${f.ms === null ? 'never found' : `found after ${f.ms} ms`} (bound ${s.options.searchBoundMs} ms)`);
  if (s.sessions.survived !== s.sessions.members) p.push(`sessions: ${s.sessions.members - s.sessions.survived} of ${s.sessions.members} lost`);
  if (s.unclean.length) p.push(`${s.unclean.length} unclean error answer(s), e.g. ${s.unclean.slice(0, 3).join(' | ')}`);
  for (const g of s.galera) if (g.size !== 3 || g.state !== 'Synced') p.push(`Galera ${g.node}: size ${g.size}, ${g.state}`);
  // a stop that waits on the clients' open connections is not an outage: the store went on serving
  if (s.storeAway && s.storeAway.ms > s.options.storeAwayMs + 10_000)
    p.push(`S3 fake away ${(s.storeAway.ms / 1000).toFixed(0)} s instead of ${s.options.storeAwayMs / 1000} s: stopping it took too long`);
  if (s.storeAway?.fileFree.failed) p.push(`S3 fake away: ${s.storeAway.fileFree.failed} request(s) that need no file failed`);
  return p;
}

export function formatSummary(s: ClusterSummary): string {
  const fmt = (r: Record<string, number>) =>
    Object.entries(r)
      .map(([k, v]) => `${k}×${v}`)
      .join(' ') || 'none';
  const lines = [
    `cluster fault run: ${s.options.members} members through haproxy, ${s.options.durationMs / 1000} s of load, ${(s.durationMs / 1000).toFixed(0)} s in all (storage ${s.options.storage})`,
    `  requests: ${s.requests}; errors by status: ${fmt(s.errorsByStatus)}`,
  ];
  for (const [route, r] of Object.entries(s.byRoute)) lines.push(`    ${route.padEnd(10)} ${String(r.count).padStart(5)}  ${fmt(r.statuses)}`);
  lines.push('  latency by phase (all routes):');
  for (const ph of s.phases) {
    lines.push(
      `    ${`${ph.fromS.toFixed(0)}–${ph.toS.toFixed(0)} s`.padEnd(10)} ${ph.name.padEnd(40)} ${String(ph.requests).padStart(5)} req  p50 ${String(ph.p50).padStart(5)} ms  p95 ${String(ph.p95).padStart(5)} ms  errors ${fmt(ph.errors)}`,
    );
  }
  lines.push(
    `  recovery: ${Object.entries(s.recovery)
      .map(([k, v]) => `${k} ${(v / 1000).toFixed(1)} s`)
      .join('; ')}`,
    `  submissions acknowledged ${s.submissions.acknowledged} (missing ${s.submissions.missing.length}, twice ${s.submissions.duplicated.length}); set reports ${s.reports.acknowledged} (missing ${s.reports.missing.length}, twice ${s.reports.duplicated.length}); kit items ${s.kitItems.acknowledged} (problems ${s.kitItems.problems.length}); ratings ${s.ratings.acknowledged} (problems ${s.ratings.problems.length})`,
    `  half records: ${fmt(s.dbOrphans)}`,
    `  object store (${s.objects.source}): ${s.objects.listed} objects; rows without object ${s.objects.missing.length}; objects without row ${s.objects.orphans.length} (${s.objects.leftForSweep} before the start-up sweep)`,
    `  photo jobs: ${s.photos.total} photos, ${s.photos.notReady} waiting, ${s.photos.failed} failed, ${s.photos.takenOver} taken over from a dead instance, ${s.photos.retriedAfterError} cleaned again after a logged failed try, ${s.photos.ranTwice} cleaned more than once otherwise`,
    `  search (approve → found on each instance): ${s.search.map((f) => `${f.instance} ${f.ms === null ? 'never' : `${f.ms} ms`}`).join(', ') || 'no probe'}`,
    `  sessions: ${s.sessions.survived} of ${s.sessions.members} still signed in`,
    `  answers slower than ${SLOW_MS / 1000} s: ${s.slow}`,
    `  unclean error answers: ${s.unclean.length}`,
    ...s.unclean.slice(0, 10).map((u) => `    ${u}`),
    `  Galera: ${s.galera.map((g) => `${g.node} ${g.state} (size ${g.size})`).join(', ')}`,
  );
  if (s.storeAway) {
    const uploads = Object.entries(s.storeAway.uploads.statuses)
      .map(([route, r]) => `${route} ${fmt(r.statuses)}`)
      .join('; ');
    lines.push(
      `  S3 fake away ${(s.storeAway.ms / 1000).toFixed(1)} s: ${s.storeAway.fileFree.requests} requests needing no file, ${s.storeAway.fileFree.failed} of them 5xx or unanswered; with files: ${uploads || 'none'}`,
    );
  }
  if (s.balancerLog.length)
    lines.push(`  haproxy log (abnormal sessions, state changes): ${s.balancerLog.length}`, ...s.balancerLog.slice(0, 20).map((l) => `    ${l}`));
  if (s.stuckPhotos.length) lines.push('  photos still waiting:', ...s.stuckPhotos.slice(0, 30).map((l) => `    ${l}`));
  if (s.instanceErrors.length) lines.push(`  instance error log lines: ${s.instanceErrors.length}`, ...s.instanceErrors.slice(0, 8).map((l) => `    ${l}`));
  return lines.join('\n');
}
