// Building part submissions for API tests.
import type { PartSubmission } from '@shared/schemas/part';
import { Part, PartRevision } from '../../server/db/models';
import { DEMO_BODIES } from '../../server/demo/0002-demo-camera-bodies';
import { CameraBody } from '../../server/db/models';

export const setReadyRecipe = {
  purpose: 'set-ready',
  material: 'PETG',
  nozzleMm: 0.4,
  layerMm: 0.2,
  walls: 4,
  topBottomLayers: 5,
  infillPct: 40,
  infillPattern: 'gyroid',
  hotendC: 240,
  bedC: 80,
  speedMmS: 60,
  supports: 'none',
  orientationNote: 'Plate face down',
} as const;

export function submission(overrides: Partial<Record<keyof PartSubmission, unknown>> = {}) {
  return {
    title: 'Receiver bracket for 15 mm rods',
    summary: 'Holds a wireless video receiver on a 15 mm rod with a quick thumb screw.',
    description: 'Print it **flat**. Uses an M4 thumb screw.',
    category: 'monitors-video',
    bodies: ['korvel-kx8'],
    mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }],
    keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }],
    safety: { carriesLoad: true, overhead: false, vehicle: false, heat: false },
    testedLoadKg: 0.6,
    licence: 'CC-BY-4.0',
    recipes: [setReadyRecipe],
    ...overrides,
  };
}

export async function seedBodies() {
  for (const body of DEMO_BODIES) await CameraBody.findOrCreate({ where: { slug: body.slug }, defaults: body });
}

/** Puts a part's latest revision on the shelf directly (the review desk does this for real). */
export async function publishDirectly(partId: number) {
  const part = (await Part.findByPk(partId))!;
  if (part.publishedRevisionId) await PartRevision.update({ status: 'superseded' }, { where: { id: part.publishedRevisionId } });
  await PartRevision.update({ status: 'published' }, { where: { id: part.latestRevisionId! } });
  await part.update({ status: 'published', publishedRevisionId: part.latestRevisionId, publishedAt: new Date() });
}
