// Compiles the server for `npm start` into dist-server/ with esbuild, when it is missing or older
// than its sources. One .js file per .ts file in the same folders (server/, shared/), so
// import.meta.url, the worker modules beside their callers and the migrations folder keep their
// places; relative and @shared/ imports are rewritten to the .js files, packages stay in
// node_modules. Plain JavaScript: it runs before anything TypeScript can.
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { build } from 'esbuild';

const root = resolve(import.meta.dirname, '../..');
const out = resolve(root, 'dist-server');
const stamp = resolve(out, '.built');
const sourceDirs = ['server', 'shared'];
const inputs = [...sourceDirs, 'package-lock.json', 'tsconfig.json', 'tsconfig.base.json', relative(root, import.meta.filename)];

function walk(dir) {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)]));
}

function newestMtime(path) {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return Math.max(stat.mtimeMs, ...readdirSync(path).map((e) => newestMtime(join(path, e))));
}

/** The source file an import names: `x.ts`, `x/index.ts`, or the file itself (.mjs, .js, .json). */
function sourceOf(target) {
  for (const candidate of [`${target}.ts`, join(target, 'index.ts'), target]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

const rewriteImports = {
  name: 'rewrite-imports',
  setup(b) {
    b.onResolve({ filter: /.*/ }, (args) => {
      if (args.kind === 'entry-point') return undefined;
      let target;
      if (args.path.startsWith('@shared/')) target = resolve(root, 'shared', args.path.slice('@shared/'.length));
      else if (args.path.startsWith('.')) target = resolve(args.resolveDir, args.path);
      else return { path: args.path, external: true }; // a package or a node: built-in
      const source = sourceOf(target);
      if (!source) return { errors: [{ text: `cannot find ${args.path} from ${relative(root, args.importer)}` }] };
      let path = relative(dirname(args.importer), source).split(sep).join('/').replace(/\.ts$/, '.js');
      if (!path.startsWith('.')) path = `./${path}`;
      return { path, external: true };
    });
  },
};

export async function ensureServerBuilt({ force = false } = {}) {
  const builtAt = existsSync(stamp) ? statSync(stamp).mtimeMs : 0;
  if (!force && builtAt > Math.max(...inputs.map((p) => newestMtime(resolve(root, p))))) return false;
  console.log('rigshelf: compiling the server (esbuild into dist-server/)');
  rmSync(out, { recursive: true, force: true });
  const files = sourceDirs.flatMap((d) => walk(resolve(root, d)));
  await build({
    entryPoints: files.filter((f) => f.endsWith('.ts') && !f.endsWith('.d.ts')),
    outdir: out,
    outbase: root,
    bundle: true, // only so that every import passes through rewriteImports; each file stays alone
    plugins: [rewriteImports],
    format: 'esm',
    platform: 'node',
    target: 'node20',
    sourcemap: true,
    logLevel: 'warning',
  });
  for (const file of files.filter((f) => f.endsWith('.mjs'))) {
    const to = resolve(out, relative(root, file));
    mkdirSync(dirname(to), { recursive: true });
    copyFileSync(file, to);
  }
  // a worker module still named by its .ts URL would fail only when its first task runs
  const stray = walk(out).filter((f) => f.endsWith('.js') && /\.ts["'`]\s*,\s*import\.meta\.url/.test(readFileSync(f, 'utf8')));
  if (stray.length > 0) {
    throw new Error(
      `these compiled files name a .ts module beside them; use workerModuleUrl (server/worker-module.ts): ${stray.map((f) => relative(root, f)).join(', ')}`,
    );
  }
  writeFileSync(stamp, new Date().toISOString());
  return true;
}

if (process.argv[1] === import.meta.filename) {
  try {
    await ensureServerBuilt({ force: process.argv.includes('--force') });
  } catch (err) {
    console.error(`rigshelf: the server did not compile: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  }
}
