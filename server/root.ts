// The checkout's root: the nearest folder above this module that holds package.json. The same
// answer from the sources (server/) and from the compiled server (dist-server/server/).
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

function findRoot(from: string): string {
  for (let dir = from; ; dir = dirname(dir)) {
    if (existsSync(resolve(dir, 'package.json'))) return dir;
    if (dirname(dir) === dir) throw new Error(`no package.json above ${from}`);
  }
}

export const root = findRoot(import.meta.dirname);
