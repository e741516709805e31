// The whole demo shelf as the first `npm start` seeds it (the other demo tests stop at seeder 0011).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CATEGORY_SLUGS, MOUNT_SLUGS } from '@shared/catalogue';
import { checkAdaptationLicence, isLicenceId } from '@shared/licences';
import { SET_REPORT_OUTCOMES } from '@shared/ranking';
import { Kit, Part, PartFile, PartRevision, SetReport, WantedRequest } from '../../server/db/models';
import { SHELF } from '../../server/demo/0014-demo-shelf';
import { createTestApp, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, { demo: 'full' });
}, 600_000);
afterAll(async () => {
  await t.close();
});

describe('demo shelf · first start', () => {
  it('demo shelf · first start · at least 40 parts; the published ones cover every category and every mount standard', async () => {
    expect(await Part.count()).toBeGreaterThanOrEqual(40);
    const published = await Part.findAll({ where: { status: 'published' }, include: [{ model: PartRevision, as: 'publishedRevision' }] });
    const revisions = published.map((p) => p.publishedRevision!);
    expect(new Set(revisions.map((r) => r.category))).toEqual(new Set(CATEGORY_SLUGS));
    expect(new Set(revisions.flatMap((r) => r.mounts.map((m) => m.slug)))).toEqual(new Set(MOUNT_SLUGS));
    expect(await Part.count({ where: { status: 'in_review' } })).toBeGreaterThanOrEqual(2);
  });

  it('demo shelf · every model of the new parts · sound (closed, consistently wound) and waiting for its picture', async () => {
    const titles = SHELF.map((s) => s.data.title);
    const revisions = await PartRevision.findAll({ where: { title: titles }, include: [{ model: PartFile, as: 'files' }] });
    expect(revisions).toHaveLength(titles.length);
    for (const rev of revisions) {
      const model = rev.files!.find((f) => f.kind === 'model')!;
      expect(model.analysis, rev.title).toMatchObject({ watertight: true, openEdges: 0, nonManifoldEdges: 0 });
      // these test apps draw no pictures; a running server draws them in the background
      expect(model.renderStatus).toBe('pending');
      // no invented load ratings
      expect(rev.testedLoadKg).toBeNull();
    }
  });

  it('demo shelf · adaptations · carry a licence their parent allows', async () => {
    const children = await Part.findAll({ where: { status: 'published' }, include: [{ model: PartRevision, as: 'publishedRevision' }] });
    const adaptations = children.filter((c) => c.parentId);
    expect(adaptations.length).toBeGreaterThanOrEqual(4);
    for (const child of adaptations) {
      const parent = (await Part.findByPk(child.parentId!, { include: [{ model: PartRevision, as: 'publishedRevision' }] }))!;
      const [from, to] = [parent.publishedRevision!.licence, child.publishedRevision!.licence];
      expect(isLicenceId(from) && isLicenceId(to) && checkAdaptationLicence(from, to).ok, `${from} → ${to}`).toBe(true);
    }
  });

  it('demo shelf · set reports, kits and wanted requests · every outcome, kits, open and closed requests', async () => {
    const outcomes = new Set((await SetReport.findAll({ attributes: ['outcome'] })).map((r) => r.outcome));
    expect(outcomes).toEqual(new Set(SET_REPORT_OUTCOMES));
    expect(await Kit.count()).toBeGreaterThanOrEqual(2);
    expect(await WantedRequest.count({ where: { closedAt: null } })).toBeGreaterThanOrEqual(2);
    expect(await WantedRequest.count({ where: { closeReason: 'solved' } })).toBeGreaterThanOrEqual(1);
  });
});
