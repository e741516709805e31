// Builds the client with Vite when dist/ is missing or older than any of its inputs.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { root } from './local-env';

const inputs = ['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'package-lock.json'];

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestMtime(join(path, entry)));
  return newest;
}

export function ensureClientBuilt(): void {
  const stamp = resolve(root, 'dist/.built');
  const builtAt = existsSync(stamp) ? statSync(stamp).mtimeMs : 0;
  const changedAt = Math.max(...inputs.map((p) => newestMtime(resolve(root, p))));
  if (builtAt > changedAt) return;
  console.log('rigshelf: building the client (vite build)');
  const result = spawnSync(resolve(root, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], {
    cwd: root,
    stdio: 'inherit',
  });
  if (result.status !== 0) throw new Error('vite build failed');
  writeFileSync(stamp, new Date().toISOString());
}
