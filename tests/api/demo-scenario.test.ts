import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Part } from '../../server/db/models';
import { createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, { demo: true });
  await t.services.search.start();
  await t.services.search.idle();
});
afterAll(async () => {
  await t.close();
});

describe('demo scenario · a shelf with evidence', () => {
  it('demo scenario · the demo parts · on the shelf through the review desk, with the decision on record', async () => {
    const published = await Part.findAll({ where: { status: 'published' } });
    expect(published.length).toBeGreaterThanOrEqual(5);
    for (const part of published) {
      const approvals = await AuditEvent.findAll({ where: { partId: part.id, action: 'approve' } });
      expect(approvals).toHaveLength(1);
      expect(approvals[0].actorId).not.toBe(part.authorId);
    }
    expect(await Part.count({ where: { status: 'in_review' } })).toBeGreaterThanOrEqual(1);
  });

  it('demo scenario · set reports on the dashboard yoke · its outcome warning shows', async () => {
    const res = await request(t.app).get('/api/parts/dashboard-monitor-yoke/proven').expect(200);
    expect(res.body.warnings.map((w: { text: string }) => w.text)).toContain('PLA deformed in heat in 2 of 2 reports');
    expect(res.body.byMaterial.ASA).toMatchObject({ reports: 2, heldUp: 2 });
  });

  it('demo scenario · the demo shelf ranked · by proven evidence', async () => {
    const res = await request(t.app).get('/api/search?sort=proven').expect(200);
    expect(res.body.results[0].slug).toBe('receiver-cradle-for-15-mm-rods');
    expect(res.body.results[0].reports).toBe(4);
  });
});
