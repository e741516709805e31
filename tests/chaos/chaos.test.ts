// The short chaos run inside `npm test`; `npm run test:chaos` runs the long form of the same harness.
import { describe, expect, it } from 'vitest';
import { formatSummary, runChaos, SHORT_FORM, verdict } from './harness';

describe('chaos', () => {
  it('chaos · server under mixed load with aborted uploads, submission bursts, a frozen and a killed database, then SIGTERM · loses, doubles and orphans nothing and shuts down in time', async () => {
    const summary = await runChaos({ ...SHORT_FORM, log: () => undefined });
    console.log(formatSummary(summary));
    expect(verdict(summary)).toEqual([]);
    expect(summary.submissionsAcknowledged).toBeGreaterThan(0);
    expect(summary.abortedSent).toBeGreaterThan(0);
  });
});
