import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

// The client's static import graph (what a page loads before it can show anything), walked from
// src/main.ts and from every route component the router loads. Dynamic import() and `import type`
// are left out: they cost nothing up front.
const ROOT = resolve(import.meta.dirname, '../..');
const STATIC_IMPORT = /^\s*(?:import|export)\s+(?!type\b)(?:[^'";]*?\sfrom\s+)?['"]([^'"]+)['"]/gm;

function resolveLocal(from: string, spec: string): string | null {
  let base: string;
  if (spec.startsWith('@/')) base = join(ROOT, 'src', spec.slice(2));
  else if (spec.startsWith('@shared/')) base = join(ROOT, 'shared', spec.slice(8));
  else if (spec.startsWith('.')) base = resolve(dirname(from), spec);
  else return null;
  for (const candidate of [base, `${base}.ts`, join(base, 'index.ts')]) if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  return null;
}

function roots(): string[] {
  const router = join(ROOT, 'src/router/index.ts');
  const routed = [...readFileSync(router, 'utf8').matchAll(/import\(['"]([^'"]+)['"]\)/g)].map((m) => resolveLocal(router, m[1])!);
  return [join(ROOT, 'src/main.ts'), ...routed];
}

/** Every package a client file pulls in statically, with one chain of files that leads to it. */
function packagesReached(): Map<string, string[]> {
  const reached = new Map<string, string[]>();
  const seen = new Set<string>();
  const walk = (file: string, chain: string[]) => {
    if (seen.has(file)) return;
    seen.add(file);
    const text = readFileSync(file, 'utf8').replace(/\/\/.*$/gm, '');
    for (const match of text.matchAll(STATIC_IMPORT)) {
      const spec = match[1];
      const local = resolveLocal(file, spec);
      const here = [...chain, file.slice(ROOT.length + 1)];
      if (local) walk(local, here);
      else if (!spec.startsWith('.') && !spec.startsWith('@/') && !spec.startsWith('@shared/') && !reached.has(spec)) reached.set(spec, here);
    }
  };
  for (const file of roots()) walk(file, []);
  return reached;
}

describe('client imports', () => {
  const reached = packagesReached();

  it('client import graph · walked from the entry and the routes · reaches vue and the views', () => {
    expect(roots().length).toBeGreaterThan(20);
    expect(reached.has('vue')).toBe(true);
  });

  it('client import graph · search engine, statistics, whole chart.js · none loaded with a page', () => {
    for (const heavy of ['lunr', 'jstat', 'chart.js/auto', 'primevue/chart']) {
      expect(reached.get(heavy), `${heavy} is imported through ${reached.get(heavy)?.join(' → ')}`).toBeUndefined();
    }
  });

  it('client import graph · zod · only behind import(), the submit flow’s checks included', () => {
    // forms import their schema in the submit handler (await import('@shared/schemas/…')); the submit
    // flow fetches its schemas at the first touch of the form (loadPartSchemas in partDraftSteps.ts)
    const chain = reached.get('zod');
    expect(chain, `zod is imported through ${chain?.join(' → ')}`).toBeUndefined();
  });

  it('client import graph · the theme preset · build time only (src/theme/static-css.ts)', () => {
    const preset = [...reached].filter(([spec]) => spec.startsWith('@primeuix/themes'));
    expect(preset.map(([spec, chain]) => `${spec} through ${chain.join(' → ')}`)).toEqual([]);
  });

  it('client import graph · three.js and chart.js · only behind import()', () => {
    for (const lazy of ['three', 'chart.js']) {
      expect(reached.get(lazy), `${lazy} is imported through ${reached.get(lazy)?.join(' → ')}`).toBeUndefined();
    }
  });
});
