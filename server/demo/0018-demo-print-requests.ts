// The demo crew's print requests: the 2nd AC asks the 1st AC (who has the cart printer) for parts.
// One waits for an answer, one is accepted and owed, one is handed over and still owed. None is paid:
// payments happen only through the payments service's webhook (try it on the local fake).
import type { SeedFn } from './seed';
import { Crew, CrewMember, Part, PartRevision, PrintRequest, Printer, User } from '../db/models';
import { DEMO_ACCOUNTS } from './0001-demo-crew';
import { DEMO_SECOND_MEMBER } from './0017-demo-crew-shelf';

async function demoUser(email: string): Promise<User> {
  const user = await User.findOne({ where: { email } });
  if (!user) throw new Error(`the demo print-request seeder needs the demo account ${email} (seeders 0001 and 0017)`);
  return user;
}

async function shelfPartId(title: string): Promise<number> {
  const revision = await PartRevision.findOne({ where: { title, status: 'published' } });
  const part = revision ? await Part.findByPk(revision.partId) : null;
  if (!part) throw new Error(`the demo print-request seeder needs the published demo part "${title}" (seeder 0003)`);
  return part.id;
}

/** The demo crew both are in (seeder 0017). */
async function sharedCrew(a: User, b: User): Promise<Crew> {
  const ofA = (await CrewMember.findAll({ where: { userId: a.id } })).map((m) => m.crewId);
  const both = (await CrewMember.findAll({ where: { userId: b.id } })).map((m) => m.crewId).filter((id) => ofA.includes(id));
  if (!both.length) throw new Error('the demo print-request seeder needs the demo crew with both 1st and 2nd AC (seeder 0017)');
  return (await Crew.findByPk(Math.min(...both)))!;
}

export const up: SeedFn = async ({ context: { services } }) => {
  const printRequests = services?.printRequests;
  if (!printRequests) throw new Error('the demo print-request seeder needs the print-request service');
  const owner = await demoUser(DEMO_ACCOUNTS.find((a) => a.role === 'member')!.email);
  const asker = await demoUser(DEMO_SECOND_MEMBER.email);
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
