// The demo member's camera build for the car unit of "The Salt Road", and two open wanted requests
// on the board: one from the member (a receiver plate nobody has shared yet), one from the key grip,
// already answered with a shelf part. Everything here is invented.
import type { SeedFn } from './seed';
import { Build, CameraBody, Part, PartRevision, User, WantedAnswer, WantedRequest } from '../db/models';
import { DEMO_ACCOUNTS } from './0001-demo-crew';

export const DEMO_BUILD_NAME = 'A-camera, car week';

async function demoUser(role: 'member' | 'moderator' | 'admin'): Promise<User> {
  const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
  const user = await User.findOne({ where: { email: account.email } });
  if (!user) throw new Error(`the demo builds seeder needs the demo ${role} (seeder 0001)`);
  return user;
}

async function body(slug: string): Promise<CameraBody> {
  const found = await CameraBody.findOne({ where: { slug } });
  if (!found) throw new Error(`the demo builds seeder needs the camera body ${slug} (seeder 0002)`);
  return found;
}

export const up: SeedFn = async ({ context: { sequelize } }) => {
  const member = await demoUser('member');
  const keyGrip = await demoUser('moderator');
  const dit = await demoUser('admin');
  if (await Build.findOne({ where: { ownerId: member.id, name: DEMO_BUILD_NAME } })) return;
  const kx8 = await body('korvel-kx8');
  const h6 = await body('halden-h6');
  const clipRevision = await PartRevision.findOne({ where: { title: 'Snap-on cable clip for 15 mm rods', status: 'published' } });
  const clip = clipRevision ? await Part.findByPk(clipRevision.partId) : null;

  await sequelize.transaction(async (transaction) => {
    await Build.create(
      {
        ownerId: member.id,
        name: DEMO_BUILD_NAME,
        bodyId: kx8.id,
        mounts: ['rods-15-60', 'battery-v-style', 'screw-1-4-20', 'accessory-shoe', 'gear-0-8'],
        keySizes: [
          { name: 'lens barrel', valueMm: 80, tolMm: 0.5 },
          { name: 'monitor width', valueMm: 182, tolMm: 1 },
        ],
      },
      { transaction },
    );
    await Build.create(
      { ownerId: member.id, name: 'B-camera, handheld', bodyId: h6.id, mounts: ['screw-1-4-20', 'accessory-shoe'], keySizes: [] },
      { transaction },
    );

    await WantedRequest.create(
      {
        authorId: member.id,
        title: 'Low-profile V-style receiver plate for the KX-8 top handle',
        details:
          'The wireless receiver has to ride flat behind the top handle on the car rig, powered from a small V-style battery. Anything that bolts to two 1/4-20 holes 30 mm apart and stays under 25 mm tall would do.',
        bodyId: kx8.id,
        mounts: ['battery-v-style', 'screw-1-4-20'],
        keySizes: [{ name: 'plate height', valueMm: 25, tolMm: 2 }],
        neededBy: '2026-04-10',
        searchedFor: 'low profile receiver plate',
        closeReason: null,
        closeNote: null,
        closedAt: null,
        closedBy: null,
      },
      { transaction },
    );
    const cables = await WantedRequest.create(
      {
        authorId: keyGrip.id,
        title: 'Cable clip that holds two SDI cables on 15 mm rods',
        details: 'Two 6 mm cables side by side, clipped to a 15 mm rod without tools, for the process trailer.',
        bodyId: null,
        mounts: ['rods-15-60'],
        keySizes: [{ name: 'rod bore', valueMm: 15, tolMm: 0.1 }],
        neededBy: null,
        searchedFor: null,
        closeReason: null,
        closeNote: null,
        closedAt: null,
        closedBy: null,
      },
      { transaction },
    );
    if (clip) {
      await WantedAnswer.create(
        {
          requestId: cables.id,
          partId: clip.id,
          userId: dit.id,
          note: 'Takes one cable as drawn; two fit if you print the 8 mm variant of the slot.',
          notifiedAt: new Date(),
        },
        { transaction },
      );
    }
  });
};
