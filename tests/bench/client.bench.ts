/**
 * Client benchmark: what a browser downloads and how soon it paints, per route, against the built
 * client served by the real server process (private MariaDB, demo shelf, ports of its own).
 * Prints figures; asserts nothing.
 *
 *   npm run bench:client [-- --loads 7 --no-build]
 *
 * For each route (every page of the router, as a visitor, member, moderator or admin as the page needs)
 * it loads the page with a cold cache in headless Debian chromium on loopback and records every script the page fetched until
 * the network went quiet, with no clicks or scrolling: the first load's JavaScript, raw (decoded) and
 * gzip (each file gzipped here at level 9, so the figure does not depend on what the server sends), and
 * what actually crossed the wire with its Content-Encoding. It prints the Cache-Control of a hashed
 * asset and of the page, and the median first contentful paint over --loads loads (each in a fresh
 * browser context, so nothing is cached), and when the route's own heading (main h1) appeared: the
 * first paint may be the header bar index.html draws before the app's script runs, the heading is the
 * app itself. A bare page fulfilled by the browser itself is the floor.
 * What a visitor waits for: a page with a heavy part it does not need to work (the 3D view, the make
 * page's part generator) marks the moment it works (performance mark `rigshelf:usable`, set by
 * src/lib/usable.ts once its content and form are on screen) and starts that part afterwards. Scripts
 * requested after the mark are printed apart ("after it works"); the mark counts only when the route's
 * heading was already in the page, and a page without it has every script counted as before.
 * Targets: compressed responses, hashed assets immutable for a year, ≤ 120 kB gzip of JavaScript before
 * each route works on its first load, median FCP ≤ 600 ms for home, search and a part page.
 * The machine is shared: the load average is printed beside the figures.
 *
 *   --loads N        cold loads per route with an FCP target (home, search, a part page); default 7
 *   --other-loads N  cold loads for every other route; default 3
 *   --only a,b       only the routes whose name contains one of these words
 *   --files          every script of each route's first load, largest first
 */
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { chromium, type BrowserContext } from 'playwright-core';
import { DEMO_PASSWORD } from '../../server/demo/0001-demo-crew';
import { Member, ROOT, scratchDb, spawnServer } from '../helpers/system';

function flag(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}
const LOADS = Number(flag('loads', '7'));
const OTHER_LOADS = Number(flag('other-loads', '3'));
const ONLY = flag('only', '')
  .split(',')
  .map((w) => w.trim())
  .filter(Boolean);
const BUILD = !process.argv.includes('--no-build');
const kB = (n: number) => (n / 1000).toFixed(1);

interface Route {
  name: string;
  path: string;
  as: 'visitor' | 'member' | 'moderator' | 'admin';
  fcpTarget?: boolean;
}

interface LoadFigures {
  fcpMs: number | null;
  /** When the route's own heading (main h1) was first in the page: the app, not the boot shell. */
  headingMs: number | null;
  /** When the page said it works (its `rigshelf:usable` mark), if after the heading appeared. */
  usableMs: number | null;
  /** later: requested after the page said it works. */
  scripts: { url: string; raw: number; gzip: number; wire: number; encoding: string; startedAt: number; later: boolean }[];
  documentCacheControl: string;
  assetCacheControl: string;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? (s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2) : NaN;
};

if (BUILD) {
  console.log('building the client (vite build)…');
  const built = spawnSync(join(ROOT, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' });
  if (built.status !== 0) process.exit(1);
}

const db = await scratchDb('bench-client');
let server: Awaited<ReturnType<typeof spawnServer>> | undefined;
const browser = await chromium.launch({
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  headless: true,
  args: [
    '--no-sandbox',
    '--disable-gpu',
    '--disable-quic',
    '--no-first-run',
    '--disable-background-networking',
    '--disable-component-update',
    '--disable-sync',
  ],
});
try {
  console.log('starting the server with the demo shelf…');
  // seeding the whole demo shelf takes minutes when other work shares the machine
  server = await spawnServer(db.env, { CLIENT_DIST: join(ROOT, 'dist'), RIGSHELF_DEMO: '1' }, 'bench-client', 1_500_000);
  const base = server.url;

  const member = new Member(base);
  await member.signIn('demo-member@rigshelf.test', DEMO_PASSWORD);
  const moderator = new Member(base);
  await moderator.signIn('demo-moderator@rigshelf.test', DEMO_PASSWORD);
  const visitor = new Member(base);

  const admin = new Member(base);
  await admin.signIn('demo-admin@rigshelf.test', DEMO_PASSWORD);

  const get = async <T>(who: Member, path: string) => (await (await who.request('GET', path)).json()) as T;
  const search = await get<{ results: { slug: string }[] }>(visitor, '/api/search?q=');
  const kits = await get<{ items: { id: number }[] }>(member, '/api/kits');
  const queue = await get<{ items: { partId: number }[] }>(moderator, '/api/review/queue');
  const me = await get<{ user: { id: number } }>(member, '/api/auth/me');
  const wanted = await get<{ items: { id: number }[] }>(member, '/api/wanted?status=open');
  const crews = await get<{ items: { id: number }[] }>(member, '/api/crews');
  const requests = await get<{ forMe: { id: number }[]; mine: { id: number }[] }>(member, '/api/print-requests');
  const makers = await get<{ items: { kind: string }[] }>(visitor, '/api/make');
  const part = search.results[0]?.slug;
  const allRoutes: Route[] = [
    { name: 'home', path: '/', as: 'visitor', fcpTarget: true },
    { name: 'search', path: '/search?q=plate', as: 'visitor', fcpTarget: true },
    { name: 'part page', path: `/parts/${part}`, as: 'visitor', fcpTarget: true },
    { name: 'part on set', path: `/parts/${part}/on-set`, as: 'visitor' },
    { name: 'make list', path: '/make', as: 'visitor' },
    { name: 'make a part', path: `/make/${makers.items[0]?.kind}`, as: 'visitor' },
    { name: 'profile', path: `/crew/${me.user.id}`, as: 'visitor' },
    { name: 'sign in', path: '/sign-in', as: 'visitor' },
    { name: 'register', path: '/register', as: 'visitor' },
    { name: 'forgot password', path: '/forgot-password', as: 'visitor' },
    { name: 'reset password', path: '/reset-password?token=bench', as: 'visitor' },
    { name: 'verify e-mail', path: '/verify-email?token=bench', as: 'visitor' },
    { name: 'not found', path: '/no-such-page', as: 'visitor' },
    { name: 'account', path: '/account', as: 'member' },
    { name: 'submit', path: '/parts/new', as: 'member' },
    { name: 'set report', path: `/parts/${part}/report`, as: 'member' },
    { name: 'my parts', path: '/my/parts', as: 'member' },
    { name: 'kits', path: '/kits', as: 'member' },
    { name: 'a kit', path: `/kits/${kits.items[0]?.id}`, as: 'member' },
    { name: 'kit labels', path: `/kits/${kits.items[0]?.id}/labels`, as: 'member' },
    { name: 'printers', path: '/printers', as: 'member' },
    { name: 'builds', path: '/builds', as: 'member' },
    { name: 'wanted', path: '/wanted', as: 'member' },
    { name: 'wanted new', path: '/wanted/new', as: 'member' },
    { name: 'wanted request', path: `/wanted/${wanted.items[0]?.id}`, as: 'member' },
    { name: 'crews', path: '/crews', as: 'member' },
    { name: 'a crew', path: `/crews/${crews.items[0]?.id}`, as: 'member' },
    { name: 'print requests', path: '/print-requests', as: 'member' },
    { name: 'a print request', path: `/print-requests/${requests.forMe[0]?.id ?? requests.mine[0]?.id}`, as: 'member' },
    { name: 'review queue', path: '/review', as: 'moderator' },
    { name: 'review desk', path: `/review/${queue.items[0]?.partId}`, as: 'moderator' },
    { name: 'flags', path: '/review/flags', as: 'moderator' },
    { name: 'admin accounts', path: '/admin/users', as: 'admin' },
    { name: 'admin bodies', path: '/admin/bodies', as: 'admin' },
    { name: 'admin mail', path: '/admin/mail', as: 'admin' },
  ];
  const routes = ONLY.length ? allRoutes.filter((r) => ONLY.some((w) => r.name.includes(w))) : allRoutes;

  const cookieFor = { visitor, member, moderator, admin };
  async function freshContext(as: Route['as']): Promise<BrowserContext> {
    // no service worker: its install fetches every asset for offline use (not the page's first load),
    // and once it controls the page the page's own fetches come from it and are not all reported
    const context = await browser.newContext({ baseURL: base, viewport: { width: 1366, height: 800 }, serviceWorkers: 'block' });
    const cookie = cookieFor[as].cookie;
    if (cookie) {
      const [name, value] = cookie.split(/=(.*)/s);
      await context.addCookies([{ name, value, url: base }]);
    }
    return context;
  }

  async function loadOnce(route: Route): Promise<LoadFigures> {
    const context = await freshContext(route.as);
    const page = await context.newPage();
    // a string, not a function: the bundler's helpers (keepNames) do not exist in the page
    await page.addInitScript(`
      new MutationObserver((_m, observer) => {
        if (window.__headingAt === undefined && document.querySelector('main h1')) window.__headingAt = performance.now();
        if (window.__headingAt !== undefined) observer.disconnect();
      }).observe(document, { childList: true, subtree: true });
    `);
    const pending: Promise<LoadFigures['scripts'][number] | null>[] = [];
    let documentCacheControl = '';
    let assetCacheControl = '';
    page.on('response', (response) => {
      const request = response.request();
      if (request.resourceType() === 'document') documentCacheControl = response.headers()['cache-control'] ?? '(none)';
      if (/\/assets\/.*\.js$/.test(new URL(response.url()).pathname) && !assetCacheControl) {
        assetCacheControl = response.headers()['cache-control'] ?? '(none)';
      }
      if (request.resourceType() !== 'script' && !response.url().endsWith('.js')) return;
      pending.push(
        (async () => {
          const url = new URL(response.url());
          // the body as the page got it; a preloaded chunk's body is not always kept by the browser, so
          // the same file is then fetched again here
          const body = await response.body().catch(async () => Buffer.from(await (await fetch(url)).arrayBuffer()));
          const wire = await request
            .sizes()
            .then((z) => z.responseBodySize)
            .catch(() => Number(response.headers()['content-length'] ?? NaN));
          return {
            startedAt: request.timing().startTime,
            later: false,
            url: url.pathname,
            raw: body.length,
            gzip: gzipSync(body, { level: 9 }).length,
            wire,
            encoding: response.headers()['content-encoding'] ?? 'none',
          };
        })().catch(() => null),
      );
    });
    await page.goto(route.path, { waitUntil: 'networkidle' });
    const fcpMs = await page.evaluate(() => {
      const entry = performance.getEntriesByName('first-contentful-paint')[0];
      return entry ? entry.startTime : null;
    });
    const headingMs = await page.evaluate(() => (window as unknown as { __headingAt?: number }).__headingAt ?? null);
    const mark = await page.evaluate(() => {
      const entry = performance.getEntriesByName('rigshelf:usable', 'mark')[0];
      return entry ? { at: entry.startTime, epoch: performance.timeOrigin + entry.startTime } : null;
    });
    const usable = mark && headingMs !== null && mark.at >= headingMs ? mark : null;
    const scripts = (await Promise.all(pending)).filter((s) => s !== null);
    for (const s of scripts) s.later = !!usable && s.startedAt > usable.epoch;
    await context.close();
    const unique = new Map(scripts.map((s) => [s.url, s]));
    return { fcpMs, headingMs, usableMs: usable?.at ?? null, scripts: [...unique.values()], documentCacheControl, assetCacheControl };
  }

  // the floor: a page with one heading and nothing to fetch
  const bare: number[] = [];
  for (let i = 0; i < LOADS; i++) {
    const context = await browser.newContext({ viewport: { width: 1366, height: 800 } });
    const page = await context.newPage();
    await page.route('**/*', (r) => r.fulfill({ status: 200, contentType: 'text/html', body: '<!doctype html><title>bare</title><h1>Bare page</h1>' }));
    await page.goto(`${base}/bench-bare`, { waitUntil: 'load' });
    bare.push((await page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? NaN)) as number);
    await context.close();
  }

  console.log(
    `\nclient bench · ${LOADS} cold loads per route with an FCP target, ${OTHER_LOADS} for the others · headless chromium · loopback · load average ${loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')}`,
  );
  console.log(`bare page (no script, no request): median FCP ${median(bare).toFixed(0)} ms\n`);
  const rows: string[][] = [
    [
      'route',
      'path',
      'as',
      'scripts',
      'JS raw kB',
      'JS gzip kB',
      'on the wire kB',
      'encoding',
      'after it works gzip kB',
      'FCP median ms',
      'FCP min–max',
      'heading median ms',
      'works median ms',
    ],
  ];
  const notes: string[] = [];
  for (const route of routes) {
    await loadOnce(route); // warms the server (first query of a route, search worker), not the browser
    const loads: LoadFigures[] = [];
    for (let i = 0; i < (route.fcpTarget ? LOADS : OTHER_LOADS); i++) loads.push(await loadOnce(route));
    // on a busy machine a load now and then stops before the app has drawn the route (no heading):
    // the figures come from the load that fetched the most, which is the route's whole first load
    const first = loads.reduce((a, b) => (b.scripts.reduce((t, x) => t + x.gzip, 0) > a.scripts.reduce((t, x) => t + x.gzip, 0) ? b : a));
    const unfinished = loads.filter((l) => l.headingMs === null).length;
    const before = first.scripts.filter((s) => !s.later);
    const raw = before.reduce((a, s) => a + s.raw, 0);
    const gzip = before.reduce((a, s) => a + s.gzip, 0);
    const wire = before.reduce((a, s) => a + s.wire, 0);
    const later = first.scripts.filter((s) => s.later).reduce((a, s) => a + s.gzip, 0);
    const encodings = [...new Set(first.scripts.map((s) => s.encoding))].join(',');
    const usables = loads.map((l) => l.usableMs).filter((x): x is number => x !== null);
    const fcps = loads.map((l) => l.fcpMs).filter((x): x is number => x !== null);
    const fcp = median(fcps);
    rows.push([
      route.name,
      route.path,
      route.as,
      String(before.length),
      kB(raw),
      kB(gzip) + (gzip > 120_000 ? ' (over 120)' : ''),
      kB(wire),
      encodings,
      later ? kB(later) : '–',
      fcp.toFixed(0) + (route.fcpTarget && fcp > 600 ? ' (over 600)' : ''),
      `${Math.min(...fcps).toFixed(0)}–${Math.max(...fcps).toFixed(0)}`,
      median(loads.map((l) => l.headingMs).filter((x): x is number => x !== null)).toFixed(0) + (unfinished ? ` (${unfinished} without)` : ''),
      usables.length ? median(usables).toFixed(0) : '–',
    ]);
    notes.push(`${route.name}: page Cache-Control "${first.documentCacheControl}", hashed asset Cache-Control "${first.assetCacheControl}"`);
    if (process.argv.includes('--files')) {
      for (const s of [...first.scripts].sort((a, b) => b.gzip - a.gzip))
        notes.push(`    ${kB(s.gzip).padStart(7)} kB gzip  ${kB(s.raw).padStart(7)} kB raw  ${s.url}${s.later ? '  (after it works)' : ''}`);
    }
  }
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  for (const r of rows) console.log(r.map((cell, c) => cell.padEnd(widths[c])).join('  '));
  console.log('');
  for (const n of notes) console.log(n);
  console.log(
    `\nload average after: ${loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')}`,
  );
} finally {
  await browser.close();
  await server?.dispose();
  await db.dispose();
}
