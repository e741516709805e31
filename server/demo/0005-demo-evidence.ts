// After the first shoots of the demo scenario: ratings and set reports from the Halfmoon Unit and two
// invented crew members from another unit, so the shelf shows proven figures and an outcome warning.
import { randomBytes } from 'node:crypto';
import type { SetReportInput } from '@shared/schemas/evidence';
import { hashPassword } from '../security/password';
import type { SeedFn } from './seed';
import { Part, User } from '../db/models';
import { DEMO_ACCOUNTS } from './0001-demo-crew';

const EXTRA_CREW = [
  { email: 'tobiah.renner@nightferry.test', displayName: 'Tobiah Renner', crewRole: 'Key grip, Night Ferry unit' },
  { email: 'sunniva.haldane@nightferry.test', displayName: 'Sunniva Haldane', crewRole: 'DIT, Night Ferry unit' },
];

type Who = 'member' | 'moderator' | 'admin' | 0 | 1;
type Report = Omit<SetReportInput, 'conditions'> & { by: Who; conditions?: SetReportInput['conditions'] };

const EVIDENCE: { slug: string; ratings: [Who, number, string?][]; reports: Report[] }[] = [
  {
    slug: 'receiver-cradle-for-15-mm-rods',
    ratings: [
      ['moderator', 5, 'Slid on first time, no play.'],
      [0, 4],
      [1, 5],
    ],
    reports: [
      { by: 'moderator', production: 'The Salt Road', daysInUse: 18, outcome: 'held-up', material: 'PETG', conditions: ['vehicle'] },
      { by: 0, production: 'Night Ferry', daysInUse: 9, outcome: 'held-up', material: 'PETG', conditions: ['wet'] },
      {
        by: 1,
        production: 'Night Ferry',
        daysInUse: 9,
        outcome: 'worn-but-working',
        material: 'PETG',
        conditions: ['dust'],
        notes: 'Thumb screw thread wore; swapped for a metal insert.',
      },
      { by: 'admin', production: 'The Salt Road', daysInUse: 12, outcome: 'held-up', material: 'PETG' },
    ],
  },
  {
    slug: 'v-style-plate-spacer-6-mm',
    ratings: [['member', 4, 'Does what it says.']],
    reports: [
      { by: 'member', production: 'The Salt Road', daysInUse: 20, outcome: 'held-up', material: 'PETG' },
      { by: 0, production: 'Night Ferry', daysInUse: 6, outcome: 'held-up', material: 'PETG', conditions: ['cold'] },
    ],
  },
  {
    slug: 'lens-gear-ring-module-0-8-for-80-mm-barrels',
    ratings: [[1, 4]],
    reports: [
      { by: 1, production: 'Night Ferry', daysInUse: 4, outcome: 'held-up', material: 'PETG' },
      {
        by: 'moderator',
        production: 'The Salt Road',
        daysInUse: 7,
        outcome: 'cracked',
        material: 'PETG',
        conditions: ['impacts'],
        notes: 'Dropped from the focus puller’s belt onto concrete.',
      },
    ],
  },
  {
    slug: 'dashboard-monitor-yoke',
    ratings: [
      ['member', 5],
      [0, 4],
    ],
    reports: [
      {
        by: 0,
        production: 'Night Ferry',
        daysInUse: 3,
        outcome: 'deformed',
        material: 'PLA',
        infillPct: 30,
        walls: 3,
        conditions: ['heat', 'vehicle'],
        notes: 'Printed in PLA to save time; sagged on the dash by lunch.',
      },
      { by: 1, production: 'Night Ferry', daysInUse: 2, outcome: 'deformed', material: 'PLA', infillPct: 40, walls: 4, conditions: ['heat'] },
      { by: 'member', production: 'The Salt Road', daysInUse: 11, outcome: 'held-up', material: 'ASA', conditions: ['heat', 'vehicle'] },
      { by: 'admin', production: 'The Salt Road', daysInUse: 11, outcome: 'held-up', material: 'ASA', conditions: ['heat', 'vehicle'] },
    ],
  },
  {
    slug: 'snap-on-cable-clip-for-15-mm-rods',
    ratings: [['member', 5, 'Keeps the SDI off the follow focus.']],
    reports: [{ by: 'member', production: 'The Salt Road', daysInUse: 20, outcome: 'held-up', material: 'TPU', conditions: ['vehicle'] }],
  },
];

export const up: SeedFn = async ({ context: { services } }) => {
  if (!services) throw new Error('the demo evidence seeder needs the app services');
  const passwordHash = await hashPassword(randomBytes(24).toString('base64url'), 12);
  const extras = [];
  for (const c of EXTRA_CREW) extras.push((await User.findOrCreate({ where: { email: c.email }, defaults: { ...c, passwordHash } }))[0]);
  const demo = async (role: string) => (await User.findOne({ where: { email: DEMO_ACCOUNTS.find((a) => a.role === role)!.email } }))!;
  const people: Record<string, User> = {
    member: await demo('member'),
    moderator: await demo('moderator'),
    admin: await demo('admin'),
    0: extras[0],
    1: extras[1],
  };

  for (const entry of EVIDENCE) {
    const part = await Part.findOne({ where: { slug: entry.slug } });
    if (!part || part.status !== 'published') continue;
    for (const [who, stars, comment] of entry.ratings) await services.evidence.rate(people[who], String(part.id), { stars, comment });
    for (const { by, ...report } of entry.reports) {
      await services.evidence.fileReport(people[by], String(part.id), { conditions: [], ...report }, []);
    }
  }
};
