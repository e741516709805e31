// The demo crew's print requests: the key grip asks the 1st AC (who has the cart printer) for parts.
// One waits for an answer, one is accepted and owed, one is handed over and still owed. None is paid:
// payments happen only through the payments service's webhook (try it on the local fake).
import type { MigrationFn } from '../migrator';
import { Crew, CrewMember, Part, PartRevision, PrintRequest, Printer, User } from '../models';
import { DEMO_ACCOUNTS } from './0001-demo-crew';

const CREW_NAME = 'Halfmoon Unit camera & grip';

async function demoUser(role: 'member' | 'moderator'): Promise<User> {
  const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
  const user = await User.findOne({ where: { email: account.email } });
  if (!user) throw new Error(`the demo print-request seeder needs the demo ${role} (seeder 0001)`);
  return user;
}

async function shelfPartId(title: string): Promise<number> {
  const revision = await PartRevision.findOne({ where: { title, status: 'published' } });
  const part = revision ? await Part.findByPk(revision.partId) : null;
  if (!part) throw new Error(`the demo print-request seeder needs the published demo part "${title}" (seeder 0003)`);
  return part.id;
}

/** A crew both demo members are in (the crews seeder's, when it made one), else one of our own. */
async function sharedCrew(a: User, b: User): Promise<Crew> {
  const ofA = (await CrewMember.findAll({ where: { userId: a.id } })).map((m) => m.crewId);
  const both = (await CrewMember.findAll({ where: { userId: b.id } })).map((m) => m.crewId).filter((id) => ofA.includes(id));
  if (both.length) return (await Crew.findByPk(Math.min(...both)))!;
  const crew = await Crew.create({ name: CREW_NAME, production: 'The Salt Road', currency: 'EUR', taxRatePct: 19, createdBy: a.id });
  for (const [user, role] of [[a, 'lead'], [b, 'member']] as const) {
    if (!(await CrewMember.findOne({ where: { crewId: crew.id, userId: user.id } }))) await CrewMember.create({ crewId: crew.id, userId: user.id, role });
  }
  return crew;
}

export const up: MigrationFn = async ({ context: { services } }) => {
  const printRequests = services?.printRequests;
  if (!printRequests) throw new Error('the demo print-request seeder needs the print-request service');
  const owner = await demoUser('member');
  const asker = await demoUser('moderator');
  if (await PrintRequest.findOne({ where: { requesterId: asker.id, ownerId: owner.id } })) return;
  const crew = await sharedCrew(owner, asker);
  const cart = await Printer.findOne({ where: { ownerId: owner.id, name: 'Cart printer' } });
  if (!cart) throw new Error('the demo print-request seeder needs the demo member’s cart printer (seeder 0004)');

  const ask = (partTitle: string, quantity: number, neededBy: string, note: string) =>
    shelfPartId(partTitle).then((partId) => printRequests.create(asker, { crewId: crew.id, printerId: cart.id, partId, quantity, neededBy, note }));

  await ask('V-style plate spacer, 6 mm', 4, '2030-03-02', 'Two for each battery plate on the dolly.');
  const accepted = await ask('Receiver cradle for 15 mm rods', 1, '2030-02-20', 'For the focus puller’s receiver on the B camera.');
  await printRequests.step(owner, accepted.id, 'accept', 'Printing it Thursday night.');
  const done = await ask('V-style plate spacer, 6 mm', 2, '2030-01-28', 'Spares for the car rig.');
  for (const step of ['accept', 'printed', 'handed-over'] as const) await printRequests.step(owner, done.id, step, null);
};
