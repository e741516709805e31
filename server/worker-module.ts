// Worker threads load their module by URL. Run from the sources (tsx, vitest) that module is
// TypeScript, loaded through tsx's loader; run from the compiled server (dist-server/) it is the
// .js file beside the caller, and tsx (a development dependency) is not needed.
const compiled = import.meta.url.endsWith('.js');

/** URL of the module `name` (no extension) beside `base`, the caller's import.meta.url. */
export function workerModuleUrl(name: string, base: string): string {
  return new URL(`${name}${compiled ? '.js' : '.ts'}`, base).href;
}

/** Code for `new Worker(code, { eval: true })` that imports the module at `url`. */
export function workerBootSource(url: string): string {
  const load = `import(${JSON.stringify(url)})`;
  return url.endsWith('.ts') ? `import('tsx/esm/api').then(({ register }) => { register(); return ${load}; })` : load;
}
