import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
const tsx = fileURLToPath(new URL('../../node_modules/.bin/tsx', import.meta.url));

// Runs a tiny program in its own Node process: Node's default for an unhandled rejection is to exit.
function run(program: string) {
  return spawnSync(tsx, ['-e', program], { cwd: root, encoding: 'utf8', timeout: 60_000 });
}

describe('process safety · unhandled rejections', () => {
  it('unhandled rejections · without the guard · Node ends the process (the failure the guard prevents)', () => {
    const result = run(`Promise.reject(new Error('lost cleanup')); setTimeout(() => process.exit(0), 200);`);
    expect(result.status).not.toBe(0);
  });

  it('unhandled rejections · with the guard · logged, and the process keeps running', () => {
    const result = run(
      `import('./server/process-safety.ts').then(({ keepRunningOnUnhandledRejections }) => {
         keepRunningOnUnhandledRejections();
         Promise.reject(new Error('lost cleanup'));
         setTimeout(() => { console.log('still serving'); process.exit(0); }, 200);
       });`,
    );
    expect(result.status).toBe(0);
    expect(result.stdout).toContain('still serving');
    expect(result.stderr).toMatch(/was not handled \(the server keeps running\)[\s\S]*lost cleanup/);
  });
});
