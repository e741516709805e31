// The Halfmoon Unit's camera department as a crew on Rigshelf: the demo member leads it, a second
// demo member (the 2nd AC) and the key grip are in it, one more address is invited. One part is
// published to the crew only (through the review desk), and the car-unit kit is shared with the crew.
// Everything here is invented.
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { PartSubmission } from '@shared/schemas/part';
import { INVITATION_LIFETIME_DAYS } from '@shared/schemas/crews';
import { inspectUploads } from '../modules/files/inspect';
import { randomStoredName } from '../modules/files/storage';
import { newToken } from '../modules/auth/tokens';
import type { SeedFn } from './seed';
import { Crew, CrewInvitation, CrewMember, Kit, KitCrewShare, User } from '../db/models';
import { transact } from '../db/transaction';
import { DEMO_ACCOUNTS } from './0001-demo-crew';
import { box, toBinaryStl } from './demo-meshes';
import { demoPhoto } from './demo-photos';

export const DEMO_CREW_NAME = 'Halfmoon Unit camera';
/** A second demo member, so two members of one crew can work with each other. */
export const DEMO_SECOND_MEMBER = {
  email: 'demo-second-ac@rigshelf.test',
  displayName: 'Ossian Brightwater',
  role: 'member',
  crewRole: '2nd AC, Halfmoon Unit',
} as const;
export const DEMO_CREW_PART_TITLE = 'Halfmoon slate holder for the dolly';

const crewPart: PartSubmission = {
  title: DEMO_CREW_PART_TITLE,
  summary: 'Keeps the unit’s clapper slate on the dolly’s 15 mm rods between takes, where the 2nd AC reaches it.',
  description: 'Cut to the unit’s own slate, so it stays with the crew. Slide the slate in from the top.',
  category: 'cable-management',
  bodies: [],
  mounts: [{ slug: 'rods-15-60' }],
  keyDimensions: [{ name: 'slot width', valueMm: 12.5, tolMm: 0.3 }],
  safety: { carriesLoad: false, overhead: false, vehicle: false, heat: false },
  testedLoadKg: null,
  licence: 'CC-BY-4.0',
  recipes: [
    {
      purpose: 'set-ready',
      material: 'PETG',
      nozzleMm: 0.4,
      layerMm: 0.2,
      walls: 3,
      topBottomLayers: 4,
      infillPct: 25,
      infillPattern: 'gyroid',
      hotendC: 240,
      bedC: 80,
      speedMmS: 60,
      supports: 'none',
      orientationNote: 'Slot opening up',
    },
  ],
  parentId: null,
  drawnInInches: false,
};

async function account(role: 'member' | 'moderator' | 'admin'): Promise<User> {
  const user = await User.findOne({ where: { email: DEMO_ACCOUNTS.find((a) => a.role === role)!.email } });
  if (!user) throw new Error(`the demo crew seeder needs the demo ${role} (seeder 0001)`);
  return user;
}

export const up: SeedFn = async ({ context: { sequelize, services } }) => {
  if (!services) throw new Error('the demo crew seeder needs the app services');
  const lead = await account('member');
  const keyGrip = await account('moderator');
  const admin = await account('admin');
  if (await Crew.findOne({ where: { name: DEMO_CREW_NAME } })) return;

  // same demo password as the lead's: their hash is reused rather than worked out again
  const [second] = await User.findOrCreate({
    where: { email: DEMO_SECOND_MEMBER.email },
    defaults: { ...DEMO_SECOND_MEMBER, passwordHash: lead.passwordHash, emailVerifiedAt: new Date() },
  });

  const crew = await transact(sequelize, async (transaction) => {
    const made = await Crew.create({ name: DEMO_CREW_NAME, production: 'The Salt Road', currency: 'EUR', taxRatePct: 19, createdBy: lead.id }, { transaction });
    await CrewMember.bulkCreate(
      [
        { crewId: made.id, userId: lead.id, role: 'lead' },
        { crewId: made.id, userId: second.id, role: 'member' },
        { crewId: made.id, userId: keyGrip.id, role: 'member' },
      ],
      { transaction },
    );
    // waiting for an answer; the link was never mailed, so nobody can use it
    await CrewInvitation.create(
      {
        crewId: made.id,
        email: 'demo-loader@rigshelf.test',
        role: 'member',
        tokenHash: newToken().hash,
        invitedBy: lead.id,
        expiresAt: new Date(Date.now() + INVITATION_LIFETIME_DAYS * 86_400_000),
        acceptedAt: null,
        acceptedBy: null,
        withdrawnAt: null,
      },
      { transaction },
    );
    const kit = await Kit.findOne({ where: { ownerId: lead.id }, order: [['id', 'ASC']], transaction });
    if (kit) await KitCrewShare.create({ kitId: kit.id, crewId: made.id, access: 'read' }, { transaction });
    return made;
  });

  const mesh = toBinaryStl(box(60, 18, 40), 'slate holder');
  const modelPath = join(services.dirs.tmp, randomStoredName('.upload'));
  const photoPath = join(services.dirs.tmp, randomStoredName('.upload'));
  await writeFile(modelPath, mesh);
  const photo = await demoPhoto('box', 0x6a4c93);
  await writeFile(photoPath, photo);
  const files = await inspectUploads(
    [
      { field: 'model', path: modelPath, originalName: 'halfmoon-slate-holder.stl', size: mesh.length },
      { field: 'photo', path: photoPath, originalName: 'halfmoon-slate-holder.jpg', size: photo.length },
    ],
    { drawnInInches: false },
  );
  const created = await services.parts.create(lead, { ...crewPart, visibility: { crewId: crew.id } }, files);
  // crew-only parts pass the review desk like any other; the admin approves (the key grip is in the crew, which is allowed too)
  await services.review.decide(admin, created.id, 'approve', { note: 'Demo shelf: crew-only part, checked like any other.' });
  await services.parts.photosSettled();
};
