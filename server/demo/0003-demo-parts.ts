// Demo parts of the Halfmoon Unit's shelf, for the invented production "The Salt Road". They go
// through the real submission rules (analysis, photo cleaning); most are then put on the shelf.
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { PartSubmission } from '@shared/schemas/part';
import { inspectUploads } from '../modules/files/inspect';
import { randomStoredName } from '../modules/files/storage';
import type { SeedFn } from './seed';
import { User } from '../db/models';
import { DEMO_ACCOUNTS } from './0001-demo-crew';
import { box, clip, ring, toBinaryStl } from './demo-meshes';
import { demoPhoto, type Outline } from './demo-photos';

type Recipe = PartSubmission['recipes'][number];

const petg: Recipe = {
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
  orientationNote: 'Flat face on the bed',
  resultNotes: 'Held a 7-inch monitor through a week of handheld work.',
};
const plaFit: Recipe = {
  purpose: 'fit-test',
  material: 'PLA',
  nozzleMm: 0.4,
  layerMm: 0.28,
  walls: 2,
  topBottomLayers: 3,
  infillPct: 10,
  infillPattern: 'lines',
  hotendC: 210,
  bedC: 60,
  speedMmS: 80,
  supports: 'none',
  orientationNote: 'Print only the clamp ring to check the bore',
};
const asa: Recipe = {
  purpose: 'set-ready',
  material: 'ASA',
  nozzleMm: 0.4,
  layerMm: 0.2,
  walls: 5,
  topBottomLayers: 6,
  infillPct: 60,
  infillPattern: 'cubic',
  hotendC: 250,
  bedC: 100,
  speedMmS: 50,
  supports: 'bed-only',
  orientationNote: 'Enclosure closed, no fan for the first layers',
};
const tpu: Recipe = {
  purpose: 'set-ready',
  material: 'TPU',
  nozzleMm: 0.4,
  layerMm: 0.2,
  walls: 3,
  topBottomLayers: 4,
  infillPct: 25,
  infillPattern: 'grid',
  hotendC: 225,
  bedC: 40,
  speedMmS: 25,
  supports: 'none',
};

interface DemoPart {
  author: 'member' | 'moderator' | 'admin';
  publish: boolean;
  outline: Outline;
  tint: number;
  mesh: () => Buffer;
  data: PartSubmission;
}

const base = { description: '', bodies: [], mounts: [], keyDimensions: [], testedLoadKg: null, parentId: null, drawnInInches: false };
const noFlags = { carriesLoad: false, overhead: false, vehicle: false, heat: false };

const DEMO_PARTS: DemoPart[] = [
  {
    author: 'member',
    publish: true,
    outline: 'ring',
    tint: 0x2f7c6f,
    mesh: () => toBinaryStl(ring(14, 7.6, 22), 'receiver rod cradle'),
    data: {
      ...base,
      title: 'Receiver cradle for 15 mm rods',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'Clamps a wireless video receiver to a 15 mm rod; one thumb screw, no tools on set.',
      description: 'Bore is drawn at **15.2 mm** so it slides on printed undersize.\n\n- M4 thumb screw and nut\n- Works on the top rod or the bottom rods',
      bodies: ['korvel-kx8', 'halden-h6'],
      mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [
        { name: 'rod bore', valueMm: 15.2, tolMm: 0.2 },
        { name: 'clamp width', valueMm: 22, tolMm: 0.5 },
      ],
      safety: { ...noFlags, carriesLoad: true },
      testedLoadKg: 0.8,
      recipes: [plaFit, petg],
    },
  },
  {
    author: 'moderator',
    publish: true,
    outline: 'box',
    tint: 0x404b4c,
    mesh: () => toBinaryStl(box(100, 70, 6), 'v-style plate spacer'),
    data: {
      ...base,
      title: 'V-style plate spacer, 6 mm',
      category: 'power-batteries',
      licence: 'CC-BY-SA-4.0',
      summary: 'Lifts a V-style battery plate clear of the cheese plate bolts so the battery seats fully.',
      bodies: ['ostrava-vega-s35'],
      mounts: [{ slug: 'battery-v-style' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [
        { name: 'plate width', valueMm: 100, tolMm: 1 },
        { name: 'spacer height', valueMm: 6, tolMm: 0.2 },
      ],
      safety: { ...noFlags, carriesLoad: true },
      testedLoadKg: 1.2,
      recipes: [petg],
    },
  },
  {
    author: 'member',
    publish: true,
    outline: 'ring',
    tint: 0xb86509,
    mesh: () => toBinaryStl(ring(44, 40.2, 8, 120), 'lens gear ring 80 mm'),
    data: {
      ...base,
      title: 'Lens gear ring, module 0.8, for 80 mm barrels',
      category: 'lens-focus',
      licence: 'CC-BY-4.0',
      summary: 'A press-on follow-focus gear ring for stills lenses with an 80 mm focus barrel.',
      description: '108 teeth at module 0.8. Print slowly so the teeth stay crisp.',
      mounts: [{ slug: 'gear-0-8' }],
      keyDimensions: [{ name: 'barrel bore', valueMm: 80.4, tolMm: 0.3 }],
      safety: noFlags,
      recipes: [{ ...petg, infillPct: 100, resultNotes: 'No slip on a marked focus pull.' }],
    },
  },
  {
    author: 'admin',
    publish: true,
    outline: 'clip',
    tint: 0x1d5149,
    mesh: () => toBinaryStl(clip(11, 7.6, 10, 70), 'rod cable clip'),
    data: {
      ...base,
      title: 'Snap-on cable clip for 15 mm rods',
      category: 'cable-management',
      licence: 'CC0-1.0',
      summary: 'Keeps SDI and power runs tidy along the rods; snaps on without taking the rods out.',
      mounts: [{ slug: 'rods-15-60' }],
      keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.3 }],
      safety: noFlags,
      recipes: [tpu],
    },
  },
  {
    author: 'moderator',
    publish: true,
    outline: 'box',
    tint: 0x92490c,
    mesh: () => toBinaryStl(box(60, 40, 18), 'dashboard monitor yoke'),
    data: {
      ...base,
      title: 'Dashboard monitor yoke',
      category: 'monitors-video',
      licence: 'CC-BY-NC-4.0',
      summary: 'Holds a 5-inch director monitor on a suction-cup arm inside the picture car.',
      bodies: [],
      mounts: [{ slug: 'screw-1-4-20' }, { slug: 'accessory-shoe' }],
      keyDimensions: [{ name: 'shoe slot width', valueMm: 18.8, tolMm: 0.2 }],
      safety: { carriesLoad: true, overhead: false, vehicle: true, heat: true },
      testedLoadKg: 0.5,
      recipes: [asa],
    },
  },
  {
    author: 'member',
    publish: false,
    outline: 'box',
    tint: 0x4f5d5d,
    mesh: () => toBinaryStl(box(18.6, 20, 6), 'cold shoe cap'),
    data: {
      ...base,
      title: 'Cold-shoe cover with label slot',
      category: 'protection-caps',
      licence: 'MIT',
      summary: 'Covers an empty accessory shoe and takes a strip of camera tape for a label.',
      bodies: ['peregrine-p1', 'korvel-kx4-mini'],
      mounts: [{ slug: 'accessory-shoe' }],
      keyDimensions: [{ name: 'foot width', valueMm: 18.6, tolMm: 0.1 }],
      safety: noFlags,
      recipes: [{ ...plaFit, purpose: 'set-ready', walls: 3, infillPct: 30 }],
    },
  },
];

export const up: SeedFn = async ({ context: { services } }) => {
  if (!services) throw new Error('the demo parts seeder needs the app services');
  const byRole = async (role: string) => (await User.findOne({ where: { email: DEMO_ACCOUNTS.find((a) => a.role === role)!.email } }))!;
  const moderator = await byRole('moderator');
  const admin = await byRole('admin');
  for (const demo of DEMO_PARTS) {
    const account = DEMO_ACCOUNTS.find((a) => a.role === demo.author)!;
    const author = (await User.findOne({ where: { email: account.email } }))!;
    const modelPath = join(services.dirs.tmp, randomStoredName('.upload'));
    const photoPath = join(services.dirs.tmp, randomStoredName('.upload'));
    await writeFile(modelPath, demo.mesh());
    const photo = await demoPhoto(demo.outline, demo.tint);
    await writeFile(photoPath, photo);
    const fileName = `${demo.data.title
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .slice(0, 40)}`;
    const files = await inspectUploads(
      [
        { field: 'model', path: modelPath, originalName: `${fileName}.stl`, size: demo.mesh().length },
        { field: 'photo', path: photoPath, originalName: `${fileName}.jpg`, size: photo.length },
      ],
      { drawnInInches: false },
    );
    const created = await services.parts.create(author, demo.data, files);
    if (demo.publish) {
      // through the review desk, so the decision is on record; four eyes: nobody approves their own
      const approver = demo.author === 'moderator' ? admin : moderator;
      await services.review.decide(approver, created.id, 'approve', { note: 'Demo shelf: checked against a printed sample.' });
    }
  }
  await services.parts.photosSettled();
};
