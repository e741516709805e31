// Over 350 lines because most of it is data: the SHELF table of invented parts, one entry each.
// The rest of the demo shelf: parts in every category and for every mount standard, modelled with
// a CAD library (demo-solids.ts), most shown by the picture the server draws from the model and a few
// with stand-in photos. Adaptations carry licences their parents allow; ratings and set reports cover
// every outcome; the key grip plans a second kit; two more wanted requests are on the board.
// Everything is invented: productions, crews, people, camera bodies and part names. No part states a
// tested load: the shelf shows the caution that none was given.
import { randomBytes } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { SetReportInput } from '@shared/schemas/evidence';
import type { PartSubmission } from '@shared/schemas/part';
import { inspectUploads } from '../modules/files/inspect';
import { hashPassword } from '../security/password';
import { randomStoredName } from '../modules/files/storage';
import type { SeedFn } from './seed';
import { CameraBody, Kit, KitItem, KitShare, Part, Printer, Recipe, User, WantedAnswer, WantedRequest } from '../db/models';
import { transact } from '../db/transaction';
import { DEMO_ACCOUNTS } from './0001-demo-crew';
import { demoPhoto, type Outline } from './demo-photos';
import * as S from './demo-solids';

type RecipeIn = PartSubmission['recipes'][number];
const base = { nozzleMm: 0.4, layerMm: 0.2, supports: 'none' } as const;
const R = {
  petg: {
    ...base,
    purpose: 'set-ready',
    material: 'PETG',
    walls: 4,
    topBottomLayers: 5,
    infillPct: 40,
    infillPattern: 'gyroid',
    hotendC: 240,
    bedC: 80,
    speedMmS: 60,
  },
  pla: {
    ...base,
    purpose: 'set-ready',
    material: 'PLA',
    walls: 3,
    topBottomLayers: 4,
    infillPct: 25,
    infillPattern: 'grid',
    hotendC: 210,
    bedC: 60,
    speedMmS: 70,
  },
  plaFit: {
    ...base,
    purpose: 'fit-test',
    material: 'PLA',
    layerMm: 0.28,
    walls: 2,
    topBottomLayers: 3,
    infillPct: 10,
    infillPattern: 'lines',
    hotendC: 205,
    bedC: 60,
    speedMmS: 90,
  },
  asa: {
    ...base,
    purpose: 'set-ready',
    material: 'ASA',
    walls: 5,
    topBottomLayers: 6,
    infillPct: 50,
    infillPattern: 'cubic',
    hotendC: 250,
    bedC: 100,
    speedMmS: 50,
  },
  abs: {
    ...base,
    purpose: 'set-ready',
    material: 'ABS',
    walls: 4,
    topBottomLayers: 5,
    infillPct: 40,
    infillPattern: 'cubic',
    hotendC: 245,
    bedC: 100,
    speedMmS: 50,
  },
  tpu: {
    ...base,
    purpose: 'set-ready',
    material: 'TPU',
    walls: 3,
    topBottomLayers: 4,
    infillPct: 20,
    infillPattern: 'grid',
    hotendC: 225,
    bedC: 40,
    speedMmS: 25,
  },
  pacf: {
    ...base,
    nozzleMm: 0.6,
    layerMm: 0.25,
    purpose: 'set-ready',
    material: 'PA-CF',
    walls: 4,
    topBottomLayers: 5,
    infillPct: 50,
    infillPattern: 'gyroid',
    hotendC: 270,
    bedC: 90,
    speedMmS: 45,
  },
  pc: {
    ...base,
    purpose: 'set-ready',
    material: 'PC',
    walls: 4,
    topBottomLayers: 5,
    infillPct: 50,
    infillPattern: 'cubic',
    hotendC: 275,
    bedC: 110,
    speedMmS: 40,
  },
} satisfies Record<string, RecipeIn>;
const flat = (r: RecipeIn, note: string): RecipeIn => ({ ...r, orientationNote: note });

type Who = 'member' | 'moderator' | 'admin' | 'tobiah' | 'sunniva' | 'ilse' | 'corin';
const SAFE = { carriesLoad: false, overhead: false, vehicle: false, heat: false };
const LOAD = { ...SAFE, carriesLoad: true };

interface ShelfPart {
  by: Who;
  /** Left with the review desk instead of put on the shelf. */
  inReview?: boolean;
  /** The title of the part this one adapts (earlier in the list). */
  adapts?: string;
  photo?: [Outline, number];
  model: () => ReturnType<typeof S.plate>;
  data: Omit<PartSubmission, 'description' | 'bodies' | 'mounts' | 'keyDimensions' | 'testedLoadKg' | 'parentId' | 'drawnInInches' | 'safety'> &
    Partial<Pick<PartSubmission, 'description' | 'bodies' | 'mounts' | 'keyDimensions' | 'safety'>>;
}

const H14 = S.HOLE_1_4;
const H38 = S.HOLE_3_8;

export const SHELF: ShelfPart[] = [
  // ---- power & batteries
  {
    by: 'tobiah',
    model: () =>
      S.batteryPlate(110, 90, 6, [
        [-30, 22],
        [30, 22],
        [0, -22],
      ]),
    data: {
      title: '3-stud plate riser for the cart battery',
      category: 'power-batteries',
      licence: 'CC-BY-4.0',
      summary: 'Raises a 3-stud battery plate 6 mm so the release lever clears a cheese plate.',
      mounts: [{ slug: 'battery-3-stud' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'plate thickness', valueMm: 6, tolMm: 0.2 }],
      safety: LOAD,
      recipes: [flat(R.petg, 'Flat face on the bed')],
    },
  },
  {
    by: 'sunniva',
    model: () =>
      S.plate(96, 40, 5, [
        { d: H14, at: [-30, 0] },
        { d: H14, at: [30, 0] },
      ]),
    data: {
      title: 'V-style plate backer for a 7-inch monitor',
      category: 'power-batteries',
      licence: 'CC-BY-SA-4.0',
      summary: 'Carries a small V-style plate on the back of a director monitor so it runs off a belt battery.',
      bodies: ['halden-h6'],
      mounts: [{ slug: 'battery-v-style' }, { slug: 'screw-1-4-20' }],
      safety: LOAD,
      recipes: [flat(R.petg, 'Flat face on the bed')],
    },
  },
  {
    by: 'member',
    model: () =>
      S.tray(130, 70, 24, [
        [36, 56],
        [36, 56],
        [36, 56],
      ]),
    data: {
      title: 'Battery caddy for three small V-style packs',
      category: 'power-batteries',
      licence: 'CC-BY-4.0',
      summary: 'Keeps three charged packs upright on the cart, terminals up and covered.',
      mounts: [{ slug: 'battery-v-style' }],
      safety: SAFE,
      recipes: [flat(R.pla, 'Open side up'), R.plaFit],
    },
  },
  {
    by: 'corin',
    model: () => S.clip(8, 2, 14, 2),
    data: {
      title: 'Double D-tap lead keeper',
      category: 'power-batteries',
      licence: 'MIT',
      summary: 'Holds two D-tap leads beside a battery plate so a knock does not pull them out.',
      mounts: [{ slug: 'other', note: 'pressed onto the battery plate edge' }],
      safety: SAFE,
      recipes: [R.tpu],
    },
  },
  {
    by: 'ilse',
    model: () => S.plate(60, 60, 4, [{ d: H38, at: [0, 0] }]),
    data: {
      title: 'Charger wall plate with 3/8-16 hole',
      category: 'power-batteries',
      licence: 'CC0-1.0',
      summary: 'Puts a dual charger on a wall spigot or a grip arm in the camera truck.',
      mounts: [{ slug: 'screw-3-8-16' }],
      safety: LOAD,
      recipes: [flat(R.asa, 'Flat face on the bed')],
    },
  },
  // ---- monitors & video
  {
    by: 'moderator',
    photo: ['box', 0x404b4c],
    model: () => S.lBracket(40, 50, 60, 6),
    data: {
      title: 'Director monitor hood bracket',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'An L bracket that holds a fold-flat sun hood on a 7-inch monitor.',
      mounts: [{ slug: 'screw-1-4-20' }],
      safety: { ...SAFE, heat: true },
      recipes: [flat(R.asa, 'On its side, the bend on the bed')],
    },
  },
  {
    by: 'tobiah',
    model: () => S.shoeFoot(30, 10),
    data: {
      title: 'Wireless receiver shoe block',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'Puts a small video receiver on any accessory shoe, screw from the top.',
      bodies: ['korvel-kx4-mini', 'marlin-m-cam-4k'],
      mounts: [{ slug: 'accessory-shoe' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'foot width', valueMm: 18.6, tolMm: 0.1 }],
      safety: LOAD,
      recipes: [flat(R.petg, 'Foot down'), R.plaFit],
    },
  },
  {
    by: 'admin',
    model: () => S.railClamp(40),
    data: {
      title: 'Monitor clamp for an accessory rail',
      category: 'monitors-video',
      licence: 'CC-BY-SA-4.0',
      summary: 'Clamps a 1/4-20 monitor arm to a MIL-STD-1913 rail on a top handle.',
      mounts: [{ slug: 'rail-1913' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'rail width', valueMm: 21.2, tolMm: 0.1 }],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Channel up')],
    },
  },
  {
    by: 'sunniva',
    inReview: true,
    model: () =>
      S.plate(120, 40, 5, [
        { d: H14, at: [-40, 0] },
        { d: H14, at: [0, 0] },
        { d: H14, at: [40, 0] },
      ]),
    data: {
      title: 'SDI splitter mounting strip',
      category: 'monitors-video',
      licence: 'CC-BY-4.0',
      summary: 'Holds a small SDI splitter and its power on the video cart shelf.',
      mounts: [{ slug: 'screw-1-4-20' }],
      safety: SAFE,
      recipes: [flat(R.pla, 'Flat face on the bed')],
    },
  },
  {
    by: 'ilse',
    model: () => S.dovetail(38, 70),
    data: {
      title: '38 mm dovetail for the village monitor',
      category: 'monitors-video',
      licence: 'CERN-OHL-P-2.0',
      summary: 'A short dovetail bar so the video village monitor drops into a quick-release clamp.',
      mounts: [{ slug: 'dovetail-38' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'dovetail width', valueMm: 38, tolMm: 0.2 }],
      safety: LOAD,
      recipes: [flat(R.petg, 'Flat face on the bed')],
    },
  },
  // ---- cable management
  {
    by: 'member',
    photo: ['clip', 0x1d5149],
    model: () => S.clip(6.2, 1.6, 10, 2),
    data: {
      title: 'Two-cable SDI clip, 6 mm',
      category: 'cable-management',
      licence: 'CC-BY-4.0',
      summary: 'Keeps two 6 mm video cables side by side along a rod or handle.',
      mounts: [{ slug: 'other', note: 'cable-tied or taped' }],
      keyDimensions: [{ name: 'cable bore', valueMm: 6.2, tolMm: 0.2 }],
      safety: SAFE,
      recipes: [R.tpu, { ...R.petg, infillPct: 100 }],
    },
  },
  {
    by: 'corin',
    adapts: 'Two-cable SDI clip, 6 mm',
    model: () => S.clip(8.2, 1.8, 10, 2),
    data: {
      title: 'Two-cable clip for 8 mm power leads',
      category: 'cable-management',
      licence: 'CC-BY-SA-4.0',
      summary: 'The two-cable clip opened up for thicker 8 mm power leads on the process trailer.',
      mounts: [{ slug: 'other', note: 'cable-tied to the trailer rail' }],
      keyDimensions: [{ name: 'cable bore', valueMm: 8.2, tolMm: 0.2 }],
      safety: { ...SAFE, vehicle: true },
      recipes: [R.tpu],
    },
  },
  {
    by: 'tobiah',
    model: () => S.rodClamp(19, null, 14),
    data: {
      title: 'Cable guide for 19 mm studio rods',
      category: 'cable-management',
      licence: 'CC-BY-4.0',
      summary: 'Snaps on a 19 mm rod and guides the focus motor cable clear of the matte box.',
      mounts: [{ slug: 'rods-19-104' }],
      keyDimensions: [{ name: 'rod bore', valueMm: 19.3, tolMm: 0.2 }],
      safety: SAFE,
      recipes: [R.petg],
    },
  },
  {
    by: 'ilse',
    model: () => S.tube(24, 10, 30),
    data: {
      title: 'Strain relief sleeve for a camera power lead',
      category: 'cable-management',
      licence: 'MIT',
      summary: 'A flexible sleeve where the power lead leaves the plug, so it does not kink on the cart.',
      mounts: [{ slug: 'other', note: 'slides over the lead' }],
      safety: SAFE,
      recipes: [R.tpu],
    },
  },
  {
    by: 'admin',
    model: () => S.clip(15.2, 2.4, 8, 1),
    data: {
      title: 'Rod cable loop, 15 mm',
      category: 'cable-management',
      licence: 'CC0-1.0',
      summary: 'A narrow snap loop for 15 mm rods, for a single lead along the rods.',
      mounts: [{ slug: 'rods-15-60' }, { slug: 'rods-15-100' }],
      keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }],
      safety: SAFE,
      recipes: [R.tpu, R.petg],
    },
  },
  // ---- lens & focus
  {
    by: 'sunniva',
    model: () => S.gearRing(75.4, 100, 0.8, 7),
    data: {
      title: 'Lens gear ring, module 0.8, for 75 mm barrels',
      category: 'lens-focus',
      licence: 'CC-BY-4.0',
      summary: 'A press-on focus gear for stills lenses with a 75 mm barrel.',
      mounts: [{ slug: 'gear-0-8' }],
      keyDimensions: [{ name: 'barrel bore', valueMm: 75.4, tolMm: 0.3 }],
      safety: SAFE,
      recipes: [{ ...R.petg, infillPct: 100 }],
    },
  },
  {
    by: 'tobiah',
    adapts: 'Lens gear ring, module 0.8, for 75 mm barrels',
    model: () => S.gearRing(68.4, 92, 0.8, 7),
    data: {
      title: 'Lens gear ring, module 0.8, for 68 mm barrels',
      category: 'lens-focus',
      licence: 'CC-BY-SA-4.0',
      summary: 'The 75 mm ring redrawn for 68 mm zoom barrels; same tooth form.',
      mounts: [{ slug: 'gear-0-8' }],
      keyDimensions: [{ name: 'barrel bore', valueMm: 68.4, tolMm: 0.3 }],
      safety: SAFE,
      recipes: [{ ...R.petg, infillPct: 100 }],
    },
  },
  {
    by: 'corin',
    model: () => S.cap(54, 2, 10),
    data: {
      title: 'Front lens cap for 54 mm barrels',
      category: 'lens-focus',
      licence: 'CC-BY-NC-4.0',
      summary: 'A slip-on cap for the front of a cine prime, for the lens case.',
      mounts: [{ slug: 'other', note: 'slips over the barrel' }],
      keyDimensions: [{ name: 'barrel', valueMm: 54, tolMm: 0.3 }],
      safety: SAFE,
      recipes: [R.pla],
    },
  },
  {
    by: 'ilse',
    model: () => S.plate(40, 14, 3, []),
    data: {
      title: 'Focus marking disc blank',
      category: 'lens-focus',
      licence: 'CC0-1.0',
      summary: 'A white strip that clips beside the follow-focus knob for marks in dry-wipe pen.',
      mounts: [{ slug: 'rods-15-60' }],
      safety: SAFE,
      recipes: [R.pla],
    },
  },
  {
    by: 'member',
    inReview: true,
    model: () => S.rodClamp(15, 60, 18),
    data: {
      title: 'Lens support for 15 mm rods',
      category: 'lens-focus',
      licence: 'CC-BY-4.0',
      summary: 'A bridge between 15 mm rods that lets a long zoom rest on a padded saddle.',
      mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'rod centres', valueMm: 60, tolMm: 0.2 }],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Bores horizontal, bridge on the bed')],
    },
  },
  // ---- rods & mounting
  {
    by: 'moderator',
    model: () => S.rodClamp(15, 60, 20),
    data: {
      title: 'Rod bridge, 15 mm at 60 mm centres',
      category: 'rods-mounting',
      licence: 'CC-BY-4.0',
      summary: 'Joins a pair of 15 mm rods at 60 mm with a 1/4-20 hole underneath.',
      mounts: [{ slug: 'rods-15-60' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [
        { name: 'rod centres', valueMm: 60, tolMm: 0.2 },
        { name: 'rod bore', valueMm: 15.3, tolMm: 0.2 },
      ],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Bores horizontal'), R.plaFit],
    },
  },
  {
    by: 'tobiah',
    adapts: 'Rod bridge, 15 mm at 60 mm centres',
    model: () => S.rodClamp(15, 100, 20, H38),
    data: {
      title: 'Studio rod bridge, 15 mm at 100 mm',
      category: 'rods-mounting',
      licence: 'CC-BY-SA-4.0',
      summary: 'The 60 mm bridge widened to studio spacing, with a 3/8-16 hole.',
      mounts: [{ slug: 'rods-15-100' }, { slug: 'screw-3-8-16' }],
      keyDimensions: [{ name: 'rod centres', valueMm: 100, tolMm: 0.2 }],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Bores horizontal')],
    },
  },
  {
    by: 'sunniva',
    model: () => S.rodClamp(19, 104, 24, H38),
    data: {
      title: 'Rod bridge, 19 mm at 104 mm centres',
      category: 'rods-mounting',
      licence: 'CC-BY-NC-SA-4.0',
      summary: 'A studio 19 mm rod bridge for the heavy build, 3/8-16 underneath.',
      mounts: [{ slug: 'rods-19-104' }, { slug: 'screw-3-8-16' }],
      keyDimensions: [{ name: 'rod centres', valueMm: 104, tolMm: 0.2 }],
      safety: LOAD,
      recipes: [flat(R.pc, 'Bores horizontal')],
    },
  },
  {
    by: 'ilse',
    model: () => S.tube(24, 15.2, 20),
    data: {
      title: 'Rod end stop, 15 mm',
      category: 'rods-mounting',
      licence: 'MIT',
      summary: 'A collar at the end of a 15 mm rod so accessories cannot slide off.',
      mounts: [{ slug: 'rods-15-60' }, { slug: 'rods-15-100' }],
      keyDimensions: [{ name: 'rod bore', valueMm: 15.2, tolMm: 0.2 }],
      safety: SAFE,
      recipes: [R.petg],
    },
  },
  {
    by: 'admin',
    model: () => S.dovetail(38, 120),
    data: {
      title: 'Long 38 mm dovetail for balance',
      category: 'rods-mounting',
      licence: 'CC-BY-4.0',
      summary: 'A 120 mm dovetail so the camera can slide for balance on a gimbal or a head.',
      mounts: [{ slug: 'dovetail-38' }, { slug: 'screw-1-4-20' }, { slug: 'screw-3-8-16' }],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Flat face on the bed')],
    },
  },
  {
    by: 'corin',
    model: () =>
      S.plate(100, 60, 8, [
        { d: H14, at: [-35, -15] },
        { d: H14, at: [-35, 15] },
        { d: H38, at: [0, 0] },
        { d: H14, at: [35, -15] },
        { d: H14, at: [35, 15] },
      ]),
    data: {
      title: 'Cheese plate, 100 × 60 mm',
      category: 'rods-mounting',
      licence: 'CC-BY-4.0',
      summary: 'A small plate with 1/4-20 and 3/8-16 holes to gather accessories on a cage.',
      mounts: [{ slug: 'screw-1-4-20' }, { slug: 'screw-3-8-16' }],
      safety: LOAD,
      recipes: [flat(R.pacf, 'Flat face on the bed')],
    },
  },
  // ---- shoe & top
  {
    by: 'member',
    model: () => S.shoeFoot(22, 6),
    data: {
      title: 'Shoe adapter with 1/4-20 hole',
      category: 'shoe-top',
      licence: 'CC-BY-4.0',
      summary: 'Turns any accessory shoe into a 1/4-20 mounting point for a small light or a receiver.',
      mounts: [{ slug: 'accessory-shoe' }, { slug: 'screw-1-4-20' }],
      keyDimensions: [{ name: 'foot width', valueMm: 18.6, tolMm: 0.1 }],
      safety: LOAD,
      recipes: [R.petg, R.plaFit],
    },
  },
  {
    by: 'sunniva',
    adapts: 'Shoe adapter with 1/4-20 hole',
    model: () => S.shoeFoot(28, 10, H38),
    data: {
      title: 'Shoe adapter with 3/8-16 hole',
      category: 'shoe-top',
      licence: 'CC-BY-4.0',
      summary: 'The shoe adapter with a 3/8-16 hole and a wider base for a heavier arm.',
      mounts: [{ slug: 'accessory-shoe' }, { slug: 'screw-3-8-16' }],
      safety: LOAD,
      recipes: [R.petg],
    },
  },
  {
    by: 'tobiah',
    model: () => S.railClamp(24),
    data: {
      title: 'Top handle rail stop',
      category: 'shoe-top',
      licence: 'CC-BY-NC-4.0',
      summary: 'A stop at the end of a top handle rail so a sliding accessory cannot fall off.',
      mounts: [{ slug: 'rail-1913' }],
      safety: SAFE,
      recipes: [R.petg],
    },
  },
  {
    by: 'ilse',
    model: () => S.shoeFoot(20, 4),
    data: {
      title: 'Shoe slate holder',
      category: 'shoe-top',
      licence: 'CC0-1.0',
      summary: 'Holds a small marker slate on the accessory shoe for B-camera ident shots.',
      mounts: [{ slug: 'accessory-shoe' }],
      safety: SAFE,
      recipes: [R.pla],
    },
  },
  // ---- protection & caps
  {
    by: 'corin',
    photo: ['ring', 0x92490c],
    model: () => S.cap(32, 1.6, 8),
    data: {
      title: 'Body port cap, 32 mm',
      category: 'protection-caps',
      licence: 'CC-BY-4.0',
      summary: 'Covers an unused 32 mm port on a camera body from dust and sand.',
      bodies: ['ostrava-vega-s35'],
      mounts: [{ slug: 'other', note: 'push fit over the port' }],
      safety: SAFE,
      recipes: [R.tpu],
    },
  },
  {
    by: 'admin',
    model: () => S.cap(16, 1.6, 12),
    data: {
      title: 'Rod end caps, 15 mm',
      category: 'protection-caps',
      licence: 'CC0-1.0',
      summary: 'Soft caps for the ends of 15 mm rods so they do not mark the case or a forehead.',
      mounts: [{ slug: 'rods-15-60' }],
      safety: SAFE,
      recipes: [R.tpu],
    },
  },
  {
    by: 'member',
    model: () => S.cap(20, 1.6, 14),
    data: {
      title: 'Rod end caps, 19 mm',
      category: 'protection-caps',
      licence: 'CC0-1.0',
      summary: 'The same soft caps for 19 mm studio rods.',
      mounts: [{ slug: 'rods-19-104' }],
      safety: SAFE,
      recipes: [R.tpu],
    },
  },
  {
    by: 'sunniva',
    model: () => S.plate(70, 50, 2.4, []),
    data: {
      title: 'Monitor screen guard for transport',
      category: 'protection-caps',
      licence: 'CC-BY-4.0',
      summary: 'A thin guard that slides into the hood rails and protects the screen in the case.',
      mounts: [{ slug: 'other', note: 'slides into the hood' }],
      safety: SAFE,
      recipes: [R.petg],
    },
  },
  // ---- cases & storage
  {
    by: 'moderator',
    model: () =>
      S.tray(150, 80, 30, [
        [40, 60],
        [40, 60],
        [50, 60],
      ]),
    data: {
      title: 'Case insert for three receivers',
      category: 'cases-storage',
      licence: 'CC-BY-4.0',
      summary: 'A foam-free insert that keeps three wireless receivers and their leads apart in a case.',
      safety: SAFE,
      recipes: [flat(R.pla, 'Open side up')],
    },
  },
  {
    by: 'tobiah',
    model: () =>
      S.tray(120, 40, 16, [
        [16, 30],
        [16, 30],
        [16, 30],
        [16, 30],
        [16, 30],
        [16, 30],
      ]),
    data: {
      title: 'Media card caddy, six slots',
      category: 'cases-storage',
      licence: 'MIT',
      summary: 'Six slots for full and empty media cards, with room for a label strip.',
      safety: SAFE,
      recipes: [flat(R.pla, 'Open side up')],
    },
  },
  {
    by: 'ilse',
    model: () =>
      S.tray(100, 60, 20, [
        [45, 50],
        [45, 50],
      ]),
    data: {
      title: 'Lens cap and filter tray',
      category: 'cases-storage',
      licence: 'CC-BY-SA-4.0',
      summary: 'Two pockets on the camera cart for caps and a filter in its pouch.',
      safety: SAFE,
      recipes: [flat(R.pla, 'Open side up')],
    },
  },
  {
    by: 'corin',
    model: () => S.lBracket(60, 30, 30, 4),
    data: {
      title: 'Cart drawer divider',
      category: 'cases-storage',
      licence: 'CC0-1.0',
      summary: 'Divides a cart drawer so tape and spare cables do not slide around.',
      safety: SAFE,
      recipes: [R.pla],
    },
  },
];

const EXTRA_CREW = [
  { key: 'ilse', email: 'ilse.marrow@lanternyard.test', displayName: 'Ilse Marrow', crewRole: '2nd AC, Lantern Yard unit' },
  { key: 'corin', email: 'corin.vasko@lanternyard.test', displayName: 'Corin Vasko', crewRole: 'Video operator, Lantern Yard unit' },
] as const;
const NIGHT_FERRY = { tobiah: 'tobiah.renner@nightferry.test', sunniva: 'sunniva.haldane@nightferry.test' };

type Report = Omit<SetReportInput, 'conditions'> & { by: Who; conditions?: SetReportInput['conditions'] };
const EVIDENCE: { title: string; ratings: [Who, number, string?][]; reports: Report[] }[] = [
  {
    title: 'Rod bridge, 15 mm at 60 mm centres',
    ratings: [
      ['member', 5, 'Square and tight on the rods.'],
      ['tobiah', 4],
      ['corin', 5],
    ],
    reports: [
      { by: 'member', production: 'The Salt Road', daysInUse: 14, outcome: 'held-up', material: 'PA-CF', conditions: ['vehicle', 'dust'] },
      { by: 'corin', production: 'Lantern Yard', daysInUse: 21, outcome: 'held-up', material: 'PA-CF' },
      {
        by: 'ilse',
        production: 'Lantern Yard',
        daysInUse: 5,
        outcome: 'failed',
        material: 'PLA',
        infillPct: 15,
        walls: 2,
        conditions: ['impacts'],
        notes: 'Printed the fit-test recipe by mistake and put it on the rig; the bridge split at the bolt hole when the rig was set down hard.',
      },
    ],
  },
  {
    title: 'Shoe adapter with 1/4-20 hole',
    ratings: [
      ['tobiah', 4],
      ['sunniva', 5, 'Lives on every camera now.'],
    ],
    reports: [
      { by: 'tobiah', production: 'Night Ferry', daysInUse: 12, outcome: 'held-up', material: 'PETG', conditions: ['wet', 'cold'] },
      {
        by: 'moderator',
        production: 'The Salt Road',
        daysInUse: 16,
        outcome: 'worn-but-working',
        material: 'PETG',
        notes: 'Foot edges rounded off after a lot of on and off.',
      },
      {
        by: 'corin',
        production: 'Lantern Yard',
        daysInUse: 3,
        outcome: 'cracked',
        material: 'PLA',
        conditions: ['cold'],
        notes: 'Cracked across the foot when tightened at dawn.',
      },
    ],
  },
  {
    title: 'Monitor clamp for an accessory rail',
    ratings: [['moderator', 4]],
    reports: [
      { by: 'moderator', production: 'The Salt Road', daysInUse: 10, outcome: 'held-up', material: 'PA-CF', conditions: ['vehicle', 'heat'] },
      {
        by: 'sunniva',
        production: 'Night Ferry',
        daysInUse: 4,
        outcome: 'failed',
        material: 'PETG',
        conditions: ['vehicle'],
        notes: 'Printed in PETG instead; the jaw crept open on the trailer and the monitor tipped onto its safety cable.',
      },
      {
        by: 'tobiah',
        production: 'Night Ferry',
        daysInUse: 4,
        outcome: 'failed',
        material: 'PETG',
        conditions: ['vehicle'],
        notes: 'Same print as Sunniva’s, same creep. Use the recipe material.',
      },
    ],
  },
  {
    title: 'Director monitor hood bracket',
    ratings: [
      ['member', 4],
      ['ilse', 3, 'Fine, but the hood rattles.'],
    ],
    reports: [
      {
        by: 'ilse',
        production: 'Lantern Yard',
        daysInUse: 8,
        outcome: 'deformed',
        material: 'PLA',
        conditions: ['heat'],
        notes: 'Sagged in a parked car at lunch.',
      },
      { by: 'corin', production: 'Lantern Yard', daysInUse: 8, outcome: 'deformed', material: 'PLA', conditions: ['heat'] },
      { by: 'member', production: 'The Salt Road', daysInUse: 15, outcome: 'held-up', material: 'ASA', conditions: ['heat'] },
    ],
  },
  {
    title: 'Lens gear ring, module 0.8, for 75 mm barrels',
    ratings: [
      ['corin', 5],
      ['member', 4],
    ],
    reports: [
      { by: 'corin', production: 'Lantern Yard', daysInUse: 20, outcome: 'held-up', material: 'PETG' },
      {
        by: 'member',
        production: 'The Salt Road',
        daysInUse: 9,
        outcome: 'worn-but-working',
        material: 'PETG',
        conditions: ['dust'],
        notes: 'Sand in the teeth; brushed out each evening.',
      },
    ],
  },
  {
    title: 'Body port cap, 32 mm',
    ratings: [
      ['tobiah', 5],
      ['member', 5],
      ['sunniva', 4],
    ],
    reports: [{ by: 'tobiah', production: 'Night Ferry', daysInUse: 30, outcome: 'held-up', material: 'TPU', conditions: ['wet', 'dust'] }],
  },
  {
    title: 'Case insert for three receivers',
    ratings: [
      ['member', 5],
      ['admin', 4],
    ],
    reports: [{ by: 'member', production: 'The Salt Road', daysInUse: 20, outcome: 'held-up', material: 'PLA', conditions: ['vehicle'] }],
  },
  {
    title: 'Two-cable SDI clip, 6 mm',
    ratings: [
      ['sunniva', 4],
      ['admin', 5],
    ],
    reports: [
      { by: 'sunniva', production: 'Night Ferry', daysInUse: 11, outcome: 'held-up', material: 'TPU', conditions: ['wet'] },
      { by: 'admin', production: 'The Salt Road', daysInUse: 18, outcome: 'worn-but-working', material: 'TPU', notes: 'Loosened a little; still holds.' },
    ],
  },
  {
    title: 'Cheese plate, 100 × 60 mm',
    ratings: [['moderator', 4]],
    reports: [{ by: 'moderator', production: 'The Salt Road', daysInUse: 12, outcome: 'held-up', material: 'PA-CF', conditions: ['vehicle'] }],
  },
  {
    title: 'Media card caddy, six slots',
    ratings: [
      ['ilse', 5, 'The label strip is the best part.'],
      ['corin', 4],
    ],
    reports: [],
  },
];

function slugOf(title: string) {
  return title
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');
}

export const up: SeedFn = async ({ context: { services, sequelize } }) => {
  if (!services) throw new Error('the demo shelf seeder needs the app services');
  const byEmail = async (email: string) => {
    const user = await User.findOne({ where: { email } });
    if (!user) throw new Error(`the demo shelf seeder needs ${email} (seeders 0001 and 0005)`);
    return user;
  };
  const passwordHash = await hashPassword(randomBytes(24).toString('base64url'), 12);
  const people = {} as Record<Who, User>;
  for (const a of DEMO_ACCOUNTS) people[a.role] = await byEmail(a.email);
  people.tobiah = await byEmail(NIGHT_FERRY.tobiah);
  people.sunniva = await byEmail(NIGHT_FERRY.sunniva);
  // two invented members of a third unit, with passwords nobody knows (only the three demo accounts sign in)
  for (const c of EXTRA_CREW) {
    people[c.key] = (
      await User.findOrCreate({
        where: { email: c.email },
        defaults: { email: c.email, displayName: c.displayName, crewRole: c.crewRole, role: 'member', passwordHash, emailVerifiedAt: new Date() },
      })
    )[0];
  }

  const ids = new Map<string, number>();
  for (const demo of SHELF) {
    const existing = await Part.findOne({ where: { slug: slugOf(demo.data.title) } });
    if (existing) {
      ids.set(demo.data.title, existing.id);
      continue;
    }
    const author = people[demo.by];
    const stl = S.solidStl(demo.model(), demo.data.title);
    const name = slugOf(demo.data.title).slice(0, 40);
    const uploads = [];
    const modelPath = join(services.dirs.tmp, randomStoredName('.upload'));
    await writeFile(modelPath, stl);
    uploads.push({ field: 'model' as const, path: modelPath, originalName: `${name}.stl`, size: stl.length });
    if (demo.photo) {
      const photo = await demoPhoto(demo.photo[0], demo.photo[1]);
      const photoPath = join(services.dirs.tmp, randomStoredName('.upload'));
      await writeFile(photoPath, photo);
      uploads.push({ field: 'photo' as const, path: photoPath, originalName: `${name}.jpg`, size: photo.length });
    }
    const files = await inspectUploads(uploads, { drawnInInches: false });
    const submission: PartSubmission = {
      description: '',
      bodies: [],
      mounts: [],
      keyDimensions: [],
      safety: SAFE,
      ...demo.data,
      testedLoadKg: null,
      parentId: demo.adapts ? (ids.get(demo.adapts) ?? null) : null,
      drawnInInches: false,
    };
    const created = await services.parts.create(author, submission, files);
    ids.set(demo.data.title, created.id);
    if (!demo.inReview) {
      const approver = demo.by === 'moderator' ? people.admin : people.moderator;
      await services.review.decide(approver, created.id, 'approve', { note: 'Demo shelf: checked against a printed sample.' });
    }
  }

  for (const entry of EVIDENCE) {
    const id = ids.get(entry.title);
    const part = id ? await Part.findByPk(id) : null;
    if (!part || part.status !== 'published') continue;
    for (const [who, stars, comment] of entry.ratings) await services.evidence.rate(people[who], String(part.id), { stars, comment });
    for (const { by, ...report } of entry.reports) await services.evidence.fileReport(people[by], String(part.id), { conditions: [], ...report }, []);
  }

  await seedNightFerryKit(sequelize, people, ids);
  await seedWanted(sequelize, people, ids);
  await services.parts.photosSettled();
};

async function recipeOf(partId: number, material: string) {
  const part = (await Part.findByPk(partId))!;
  const recipe = await Recipe.findOne({ where: { revisionId: part.publishedRevisionId!, material } });
  if (!recipe) throw new Error(`the demo part ${part.slug} has no ${material} recipe`);
  return recipe;
}

const KIT_NAME = 'Night Ferry — process trailer';

async function seedNightFerryKit(sequelize: Parameters<SeedFn>[0]['context']['sequelize'], people: Record<Who, User>, ids: Map<string, number>) {
  const keyGrip = people.moderator;
  if (await Kit.findOne({ where: { ownerId: keyGrip.id, name: KIT_NAME } })) return;
  const lines = [
    { title: 'Rod bridge, 15 mm at 60 mm centres', material: 'PA-CF', quantity: 2 },
    { title: 'Monitor clamp for an accessory rail', material: 'PA-CF', quantity: 2 },
    { title: 'Two-cable clip for 8 mm power leads', material: 'TPU', quantity: 12 },
    { title: 'Body port cap, 32 mm', material: 'TPU', quantity: 4 },
    { title: 'Case insert for three receivers', material: 'PLA', quantity: 1 },
  ];
  const items: { partId: number; recipe: Recipe; quantity: number }[] = [];
  for (const line of lines) {
    const partId = ids.get(line.title)!;
    items.push({ partId, recipe: await recipeOf(partId, line.material), quantity: line.quantity });
  }
  await transact(sequelize, async (transaction) => {
    const printer = await Printer.create(
      {
        ownerId: keyGrip.id,
        name: 'Grip truck printer',
        bedXMm: 250,
        bedYMm: 210,
        bedZMm: 220,
        nozzleMm: 0.6,
        watts: null,
        notes: 'Hardened nozzle for the filled nylon.',
      },
      { transaction },
    );
    const kit = await Kit.create(
      {
        ownerId: keyGrip.id,
        name: KIT_NAME,
        production: 'Night Ferry',
        startsOn: '2026-05-04',
        endsOn: '2026-05-15',
        locationNotes: 'Night driving on the coast road: picture car on the process trailer, spray and wind, monitors on the trailer rail.',
        heatExposure: null,
        printHoursPerDay: 10,
        printerPrice: null,
      },
      { transaction },
    );
    await KitItem.bulkCreate(
      items.map((item, position) => ({
        kitId: kit.id,
        partId: item.partId,
        position,
        quantity: item.quantity,
        recipeId: item.recipe.id,
        material: null,
        printerId: printer.id,
        boughtPriceEach: null,
        servicePriceEach: null,
        serviceShipping: null,
      })),
      { transaction },
    );
    await KitShare.create({ kitId: kit.id, userId: people.member.id, access: 'edit' }, { transaction });
  });
}

async function seedWanted(sequelize: Parameters<SeedFn>[0]['context']['sequelize'], people: Record<Who, User>, ids: Map<string, number>) {
  const title = 'Matte box flag holder for 19 mm rods';
  if (await WantedRequest.findOne({ where: { title } })) return;
  const body = await CameraBody.findOne({ where: { slug: 'halden-h6' } });
  await transact(sequelize, async (transaction) => {
    await WantedRequest.create(
      {
        authorId: people.corin.id,
        title,
        details: 'A holder that clamps on a 19 mm rod and takes a small black flag beside the matte box, to cut flare from a practical. Tool-free on and off.',
        bodyId: body?.id ?? null,
        mounts: ['rods-19-104'],
        keySizes: [{ name: 'rod bore', valueMm: 19, tolMm: 0.1 }],
        neededBy: '2026-06-01',
        searchedFor: 'flag holder 19 mm',
        closeReason: null,
        closeNote: null,
        closedAt: null,
        closedBy: null,
      },
      { transaction },
    );
    const caps = await WantedRequest.create(
      {
        authorId: people.sunniva.id,
        title: 'Soft caps for the ends of studio rods',
        details: 'The 19 mm rods stick out past the cage on the handheld build; something soft on the ends before someone gets hurt.',
        bodyId: null,
        mounts: ['rods-19-104'],
        keySizes: [{ name: 'rod', valueMm: 19, tolMm: 0.2 }],
        neededBy: null,
        searchedFor: 'rod end cap',
        closeReason: 'solved',
        closeNote: 'The 19 mm rod end caps fit; printed a bag of them.',
        closedAt: new Date('2026-05-02T18:00:00Z'),
        closedBy: people.sunniva.id,
      },
      { transaction },
    );
    const capsPart = ids.get('Rod end caps, 19 mm');
    if (capsPart) {
      await WantedAnswer.create(
        { requestId: caps.id, partId: capsPart, userId: people.member.id, note: 'These are TPU and stay on.', notifiedAt: new Date() },
        { transaction },
      );
    }
  });
}
