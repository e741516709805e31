// Chaos run shared by `npm run test:chaos` (long form) and tests/chaos/chaos.test.ts (short form
// inside `npm test`): mixed load through the real server process while uploads are aborted
// mid-stream, parts are submitted in bursts, the database is frozen (SIGSTOP) and killed (SIGKILL,
// then restarted), and SIGTERM ends it; then the shelf is checked for lost, doubled or orphaned work.
import { existsSync, readdirSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { join } from 'node:path';
import { boxStl } from '../helpers/meshes';
import { plainPng } from '../helpers/photos';
import { checkStoredFiles } from '../helpers/stored-files-check';
import {
  countByRoute,
  databaseOrphans,
  pick,
  ratingProblems as checkRatings,
  Recorder,
  rowsOf,
  SEARCH_WORDS,
  submissionProblems,
  type RatingAttempt,
} from '../helpers/mixed-load';
import {
  addMembers,
  loadSubmission,
  Member,
  publishedParts,
  scratchDb,
  sleep,
  spawnServer,
  waitFor,
  type ScratchDb,
  type ServerProcess,
} from '../helpers/system';

export interface ChaosOptions {
  /** Signed-in members sending the mixed load. */
  members: number;
  /** How long the load runs before SIGTERM. */
  durationMs: number;
  /** How long MariaDB stays frozen (SIGSTOP … SIGCONT). */
  freezeMs: number;
  /** How long MariaDB stays dead after SIGKILL before it is started again. */
  deadMs: number;
  /** Uploads cut off mid-stream, spread over the run. */
  abortedUploads: number;
  /** Moments when every member submits a part at once. */
  bursts: number;
  /** /api/health must answer within this (503 counts as an answer). */
  healthLimitMs: number;
  /** The server's SHUTDOWN_TIMEOUT_S. */
  shutdownTimeoutS: number;
  log?: (line: string) => void;
}

export const LONG_FORM: ChaosOptions = {
  members: 25,
  durationMs: 90_000,
  freezeMs: 20_000,
  deadMs: 5_000,
  abortedUploads: 40,
  bursts: 3,
  healthLimitMs: 1000,
  shutdownTimeoutS: 10,
};

// Sized for the CI budget on a shared 2-core machine: the same faults, shorter and with fewer members.
// The health bound is looser than the long form's 1 s because other test files share the CPU; it
// still proves that health never waits for a frozen database (the freeze lasts longer than the bound).
export const SHORT_FORM: ChaosOptions = {
  members: 6,
  durationMs: 30_000,
  freezeMs: 6_000,
  deadMs: 2_000,
  abortedUploads: 8,
  bursts: 2,
  healthLimitMs: 3000,
  shutdownTimeoutS: 5,
};

type Route = 'search' | 'part' | 'download' | 'submit' | 'rate' | 'health' | 'aborted-upload' | 'burst-submit';

export interface ChaosSummary {
  options: ChaosOptions;
  requests: number;
  byRoute: Record<string, { count: number; statuses: Record<string, number> }>;
  unexpectedExit: string | null;
  server500: number;
  server500OutsideFaults: number;
  deadlock500: number;
  deadlockLogLines: number;
  submissionsAcknowledged: number;
  submissionsMissing: string[];
  submissionsDuplicated: string[];
  ratingsAcknowledged: number;
  ratingProblems: string[];
  dbOrphans: Record<string, number>;
  diskOrphans: string[];
  /** Files without rows after the run (a commit that went unanswered leaves them), before the restart's sweep. */
  leftForSweep: number;
  health: { probes: number; maxMs: number; over1s: number; overLimit: number; unanswered: number; during: Record<string, number> };
  faults: { name: string; from: number; to: number }[];
  shutdown: { signalledAt: number; exitedAfterMs: number | null; code: number | null; signal: string | null; stoppedLine: boolean };
  abortedSent: number;
  durationMs: number;
}

const submissionData = loadSubmission;

export async function runChaos(options: ChaosOptions): Promise<ChaosSummary> {
  const log = options.log ?? ((line: string) => console.log(`chaos: ${line}`));
  const runId = Date.now().toString(36);
  const recorder = new Recorder();
  const samples = recorder.samples;
  const faults: ChaosSummary['faults'] = [];
  const submissions: { title: string; status: number; at: number }[] = [];
  const ratings: RatingAttempt[] = [];
  const started = Date.now();
  let db: ScratchDb | null = null;
  let server: ServerProcess | null = null;
  let signalledAt = 0;
  let stopLoad = false;

  try {
    log('starting a private MariaDB and the server');
    db = await scratchDb('chaos');
    server = await spawnServer(db.env, { SHUTDOWN_TIMEOUT_S: String(options.shutdownTimeoutS), DB_WAIT_S: '60' }, 'chaos');
    const srv = server;
    const password = 'chaos load password 1';
    const emails = await addMembers(db.db, `chaos-${runId}`, options.members, password);
    const members: { email: string; client: Member }[] = [];
    for (const email of emails) {
      const client = new Member(srv.url);
      await client.signIn(email, password);
      members.push({ email, client });
    }
    const stl = boxStl(40, 30, 6);
    const png = await plainPng(48, 32);
    const { ids: partIds, downloads } = await publishedParts(db.db, srv.url, 5, stl);
    log(`${members.length} members signed in; ${partIds.length} published parts; load for ${options.durationMs / 1000} s`);

    const timed = (route: Route, run: () => Promise<Response>) => recorder.timed(route, run);

    let counter = 0;
    async function submit(client: Member, route: Route) {
      counter += 1;
      const title = `Chaos plate ${runId} ${counter}`;
      const form = new FormData();
      form.append('data', JSON.stringify(submissionData(title)));
      form.append('model', new Blob([new Uint8Array(stl)]), 'plate.stl');
      if (counter % 3 === 0) form.append('photo', new Blob([new Uint8Array(png)], { type: 'image/png' }), 'plate.png');
      const s = await timed(route, () => client.request('POST', '/api/parts', form));
      submissions.push({ title, status: s.status, at: s.at });
    }

    async function member(m: { email: string; client: Member }) {
      while (!stopLoad) {
        const roll = Math.random();
        const c = m.client;
        if (roll < 0.3) await timed('search', () => c.request('GET', `/api/search?q=${encodeURIComponent(pick(SEARCH_WORDS))}`));
        else if (roll < 0.55) await timed('part', () => c.request('GET', `/api/parts/${pick(partIds)}`));
        else if (roll < 0.7) await timed('download', () => c.request('GET', pick(downloads)));
        else if (roll < 0.85) await submit(c, 'submit');
        else {
          const partId = pick(partIds);
          const stars = 1 + Math.floor(Math.random() * 5);
          const s = await timed('rate', () => c.request('POST', `/api/parts/${partId}/ratings`, { stars }));
          ratings.push({ member: m.email, partId, stars, status: s.status, at: s.at });
        }
        await sleep(50 + Math.random() * 100);
      }
    }

    async function healthProbe() {
      while (!stopLoad && !signalledAt) {
        await timed('health', () => fetch(`${srv.url}/api/health`, { signal: AbortSignal.timeout(30_000) }));
        await sleep(250);
      }
    }

    // A client that loses its connection half-way through a multipart upload.
    function abortedUpload(client: Member): Promise<void> {
      return new Promise((done) => {
        const at = Date.now();
        const boundary = `----chaos${Math.random().toString(16).slice(2)}`;
        const head = Buffer.from(
          `--${boundary}\r\nContent-Disposition: form-data; name="data"\r\n\r\n${JSON.stringify(submissionData(`Chaos aborted ${runId}`))}\r\n` +
            `--${boundary}\r\nContent-Disposition: form-data; name="model"; filename="cut.stl"\r\nContent-Type: application/octet-stream\r\n\r\n`,
        );
        const req = httpRequest(`${srv.url}/api/parts`, {
          method: 'POST',
          agent: false,
          headers: {
            cookie: client.cookie,
            'x-csrf-token': client.token,
            'content-type': `multipart/form-data; boundary=${boundary}`,
            'content-length': String(head.length + 4_000_000),
          },
        });
        const finish = (status: number) => {
          samples.push({ route: 'aborted-upload', status, ms: Date.now() - at, at });
          done();
        };
        req.on('response', (res) => {
          res.resume();
          finish(res.statusCode ?? 0);
        });
        req.on('error', () => finish(-1));
        req.write(head);
        req.write(stl);
        req.write(Buffer.alloc(200_000, 7));
        setTimeout(() => req.destroy(), 80 + Math.random() * 150);
      });
    }

    async function fault(name: string, run: () => Promise<void>) {
      const from = Date.now();
      log(`fault: ${name}`);
      await run();
      faults.push({ name, from, to: Date.now() });
    }

    const t0 = Date.now();
    const at = (fraction: number) => sleep(Math.max(0, t0 + options.durationMs * fraction - Date.now()));
    const load = members.map((m) => member(m));
    const health = healthProbe();
    const aborts = (async () => {
      for (let i = 0; i < options.abortedUploads && !stopLoad; i++) {
        await abortedUpload(pick(members).client);
        await sleep(options.durationMs / (options.abortedUploads + 1));
      }
    })();
    const script = (async () => {
      for (let b = 0; b < options.bursts; b++) {
        await at(0.1 + (0.8 * b) / Math.max(1, options.bursts));
        if (stopLoad) return;
        log(`burst: ${members.length} submissions at once`);
        await Promise.all(members.map((m) => submit(m.client, 'burst-submit')));
      }
    })();
    const dbFaults = (async () => {
      await at(0.25);
      if (stopLoad) return;
      const pid = db!.db.pid();
      if (!pid) throw new Error('no MariaDB pid');
      await fault(`MariaDB frozen (SIGSTOP) for ${options.freezeMs / 1000} s`, async () => {
        process.kill(pid, 'SIGSTOP');
        await sleep(options.freezeMs);
        process.kill(pid, 'SIGCONT');
      });
      await at(0.55);
      if (stopLoad) return;
      await fault(`MariaDB killed (SIGKILL), restarted after ${options.deadMs / 1000} s`, async () => {
        process.kill(db!.db.pid()!, 'SIGKILL');
        await waitFor(() => db!.db.pid() === null, 10_000);
        await sleep(options.deadMs);
        await db!.db.start();
      });
    })();
    // a server that dies ends the run early: nothing after that would tell more
    void srv.exited.then(() => {
      if (!signalledAt) stopLoad = true;
    });
    const watchdog = Promise.race([srv.exited, at(1)]);
    await Promise.all([dbFaults, script, watchdog]);

    let unexpectedExit: string | null = null;
    if (srv.exit) {
      const errLines = srv.lines.filter((l) => l.stream === 'err' && l.text.trim()).map((l) => l.text.trim());
      const last = errLines.filter((t) => /Error\b|^rigshelf:/.test(t)).pop() ?? errLines.slice(-3).join(' | ');
      unexpectedExit = `the server exited during the run after ${((srv.exit.at - t0) / 1000).toFixed(1)} s (code ${srv.exit.code}, signal ${srv.exit.signal}): ${last}`;
    } else {
      signalledAt = Date.now();
      log('SIGTERM to the server while the load goes on');
      srv.child.kill('SIGTERM');
      await Promise.race([srv.exited, sleep((options.shutdownTimeoutS + 20) * 1000)]);
    }
    stopLoad = true;
    await Promise.all([...load, health, aborts]);
    if (!srv.exit) {
      srv.child.kill('SIGKILL');
      await srv.exited;
    }
    log('load stopped; checking the shelf');

    // ---- checks, against the database and the uploads folder the server left behind
    const sql = rowsOf((q) => db!.db.sql(q));
    const checked = await submissionProblems(sql, 'rigshelf', `Chaos plate ${runId} %`, submissions);
    const ratingProblems = await checkRatings(sql, 'rigshelf', `chaos-${runId}-%`, ratings);
    const dbOrphans = await databaseOrphans(sql, 'rigshelf');

    const files = await sql('SELECT kind, stored_name, processing, render_status FROM rigshelf.part_files');
    const reportPhotos = await sql('SELECT stored_name, processing FROM rigshelf.report_photos');
    const list = (dir: string) => (existsSync(join(srv.uploadsDir, dir)) ? readdirSync(join(srv.uploadsDir, dir)) : []);
    const rows = {
      partFiles: files.map(([kind, storedName, processing, renderStatus]) => ({ kind, storedName, processing, renderStatus })),
      photos: reportPhotos.map(([storedName, processing]) => ({ storedName, processing })),
    };
    const storedCheck = () => checkStoredFiles(rows, [...list('store').map((n) => `store/${n}`), ...list('incoming').map((n) => `incoming/${n}`)]);
    const diskOrphans: string[] = [];
    // rows without their files are lost work, whatever happens next
    diskOrphans.push(...storedCheck().missing);
    // Files without rows are what a commit cut off without an answer leaves on purpose (it may have
    // landed); the next start's sweep must remove them, so start the server once more and look again.
    const unclaimed = () => [...list('tmp').map((n) => `tmp/${n} (an upload nobody finished)`), ...storedCheck().unclaimed];
    const leftForSweep = unclaimed().length;
    if (leftForSweep) {
      log(`${leftForSweep} file(s) without rows; starting the server again so its start-up sweep settles them`);
      const again = await spawnServer(db.env, { UPLOADS_DIR: srv.uploadsDir, DB_WAIT_S: '60' }, 'chaos-restart');
      again.child.kill('SIGTERM');
      await again.exited;
      await again.dispose();
    }
    diskOrphans.push(...unclaimed());

    // ---- figures
    const inFault = (t: number) => faults.some((f) => t >= f.from - 500 && t <= f.to + 5000);
    const loadSamples = samples.filter((s) => s.route !== 'health');
    const s500 = loadSamples.filter((s) => s.status === 500);
    const deadlockPattern = /deadlock|ER_LOCK_DEADLOCK|lock wait timeout|ER_LOCK_WAIT_TIMEOUT/i;
    const healthSamples = samples.filter((s) => s.route === 'health' && (!signalledAt || s.at < signalledAt));
    const during: Record<string, number> = {};
    for (const f of faults) {
      const inside = healthSamples.filter((s) => s.at <= f.to && s.at + s.ms >= f.from);
      during[f.name] = inside.reduce((m, s) => Math.max(m, s.ms), 0);
    }
    const byRoute = countByRoute(samples);
    const exit = srv.exit as ServerProcess['exit'];
    return {
      options,
      requests: samples.length,
      byRoute,
      unexpectedExit,
      server500: s500.length,
      server500OutsideFaults: s500.filter((s) => !inFault(s.at)).length,
      deadlock500: s500.filter((s) => deadlockPattern.test(s.body ?? '')).length,
      deadlockLogLines: srv.lines.filter((l) => l.stream === 'err' && /Deadlock found|ER_LOCK_DEADLOCK/.test(l.text)).length,
      submissionsAcknowledged: checked.acknowledged,
      submissionsMissing: checked.missing,
      submissionsDuplicated: checked.duplicated,
      ratingsAcknowledged: ratings.filter((r) => r.status === 200 || r.status === 201).length,
      ratingProblems,
      dbOrphans,
      diskOrphans,
      leftForSweep,
      health: {
        probes: healthSamples.length,
        maxMs: healthSamples.reduce((m, s) => Math.max(m, s.ms), 0),
        over1s: healthSamples.filter((s) => s.ms > 1000 || s.status === 0).length,
        overLimit: healthSamples.filter((s) => s.ms > options.healthLimitMs || s.status === 0).length,
        unanswered: healthSamples.filter((s) => s.status === 0).length,
        during,
      },
      faults: faults.map((f) => ({ name: f.name, from: f.from - started, to: f.to - started })),
      shutdown: {
        signalledAt: signalledAt ? signalledAt - started : 0,
        exitedAfterMs: signalledAt && exit ? exit.at - signalledAt : null,
        code: exit?.code ?? null,
        signal: exit?.signal ?? null,
        stoppedLine: srv.lines.some((l) => l.text.startsWith('rigshelf: stopped in')),
      },
      abortedSent: samples.filter((s) => s.route === 'aborted-upload').length,
      durationMs: Date.now() - started,
    };
  } finally {
    stopLoad = true;
    await server?.dispose();
    await db?.dispose();
  }
}

/** What went wrong, one sentence each; empty when the run held. */
export function verdict(s: ChaosSummary): string[] {
  const problems: string[] = [];
  if (s.unexpectedExit) problems.push(s.unexpectedExit);
  if (s.deadlock500 || s.deadlockLogLines) problems.push(`${s.deadlock500} answer(s) 500 from deadlocks (${s.deadlockLogLines} deadlock log line(s))`);
  if (s.server500OutsideFaults) problems.push(`${s.server500OutsideFaults} answer(s) 500 while the database was up`);
  if (s.submissionsMissing.length) problems.push(`${s.submissionsMissing.length} acknowledged submission(s) missing`);
  if (s.submissionsDuplicated.length) problems.push(`${s.submissionsDuplicated.length} submission(s) stored more than once`);
  if (s.ratingProblems.length) problems.push(`ratings: ${s.ratingProblems.slice(0, 5).join('; ')}`);
  for (const [name, n] of Object.entries(s.dbOrphans)) if (n) problems.push(`database: ${n} × ${name}`);
  if (s.diskOrphans.length) problems.push(`uploads folder: ${s.diskOrphans.length} orphan(s), e.g. ${s.diskOrphans.slice(0, 3).join(', ')}`);
  if (s.health.overLimit)
    problems.push(`/api/health took longer than ${s.options.healthLimitMs} ms (or did not answer) ${s.health.overLimit} time(s), worst ${s.health.maxMs} ms`);
  if (!s.unexpectedExit) {
    const limit = s.options.shutdownTimeoutS * 1000;
    if (s.shutdown.exitedAfterMs === null) problems.push('the server did not exit after SIGTERM');
    else if (s.shutdown.code !== 0 || !s.shutdown.stoppedLine)
      problems.push(`shutdown did not complete cleanly (exit code ${s.shutdown.code}, signal ${s.shutdown.signal}, after ${s.shutdown.exitedAfterMs} ms)`);
    // a process that ran into its own deadline exits with code 1, caught above; this is the wall clock
    else if (s.shutdown.exitedAfterMs > limit + 2000) problems.push(`shutdown took ${s.shutdown.exitedAfterMs} ms (deadline ${limit} ms)`);
  }
  return problems;
}

export function formatSummary(s: ChaosSummary): string {
  const lines = [
    `chaos run: ${s.options.members} members, ${s.options.durationMs / 1000} s of load, ${(s.durationMs / 1000).toFixed(0)} s in all`,
    `  requests: ${s.requests}`,
  ];
  for (const [route, r] of Object.entries(s.byRoute)) {
    lines.push(
      `    ${route.padEnd(15)} ${String(r.count).padStart(5)}  ${Object.entries(r.statuses)
        .map(([k, v]) => `${k}×${v}`)
        .join(' ')}`,
    );
  }
  lines.push(
    `  faults: ${s.faults.map((f) => `${f.name} [${(f.from / 1000).toFixed(1)}–${(f.to / 1000).toFixed(1)} s]`).join('; ')}`,
    `  aborted uploads sent: ${s.abortedSent}; server exited unexpectedly: ${s.unexpectedExit ?? 'no'}`,
    `  500 answers: ${s.server500} (${s.server500OutsideFaults} while the database was up, ${s.deadlock500} naming a deadlock; ${s.deadlockLogLines} deadlock log lines)`,
    `  acknowledged submissions: ${s.submissionsAcknowledged} (missing ${s.submissionsMissing.length}, stored twice ${s.submissionsDuplicated.length})`,
    `  acknowledged ratings: ${s.ratingsAcknowledged} (problems ${s.ratingProblems.length})`,
    `  database orphans: ${Object.entries(s.dbOrphans)
      .map(([k, v]) => `${k}=${v}`)
      .join(', ')}`,
    `  files left for the start-up sweep: ${s.leftForSweep}; uploads-folder orphans after it: ${s.diskOrphans.length}${s.diskOrphans.length ? ` (${s.diskOrphans.slice(0, 3).join(', ')})` : ''}`,
    `  /api/health: ${s.health.probes} probes, worst ${s.health.maxMs} ms, ${s.health.over1s} over 1 s, ${s.health.unanswered} unanswered; worst during faults: ${Object.entries(
      s.health.during,
    )
      .map(([k, v]) => `${k.split(' (')[0]} ${v} ms`)
      .join(', ')}`,
    s.shutdown.signalledAt
      ? `  shutdown: SIGTERM at ${(s.shutdown.signalledAt / 1000).toFixed(1)} s, exited after ${s.shutdown.exitedAfterMs ?? '—'} ms with code ${s.shutdown.code} (deadline ${s.options.shutdownTimeoutS} s)`
      : '  shutdown: SIGTERM not sent (the server had already exited)',
  );
  return lines.join('\n');
}
