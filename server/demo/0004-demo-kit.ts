// The demo member's prep day for the invented production "The Salt Road": two printers, their
// filament prices, and a car-unit kit of three shelf parts, shared read-only with the key grip.
// One item is printed in PLA on a car rig in sun, so the kit's summary shows a heat warning.
import type { SeedFn } from './seed';
import { Kit, KitItem, KitShare, Part, PartRevision, PriceSheet, Printer, Recipe, User } from '../db/models';
import { transact } from '../db/transaction';
import { DEMO_ACCOUNTS } from './0001-demo-crew';

const KIT_NAME = 'The Salt Road — car unit';

async function demoUser(role: 'member' | 'moderator'): Promise<User> {
  const account = DEMO_ACCOUNTS.find((a) => a.role === role)!;
  const user = await User.findOne({ where: { email: account.email } });
  if (!user) throw new Error(`the demo kit seeder needs the demo ${role} (seeder 0001)`);
  return user;
}

/** A published demo part by title, with its published recipe in the given material. */
async function shelfPart(title: string, material: string) {
  const revision = await PartRevision.findOne({ where: { title, status: 'published' } });
  const part = revision ? await Part.findByPk(revision.partId) : null;
  if (!revision || !part || part.publishedRevisionId !== revision.id)
    throw new Error(`the demo kit seeder needs the published demo part "${title}" (seeder 0003)`);
  const recipe = await Recipe.findOne({ where: { revisionId: revision.id, material } });
  if (!recipe) throw new Error(`the demo part "${title}" has no ${material} recipe`);
  return { part, recipe };
}

export const up: SeedFn = async ({ context: { sequelize } }) => {
  const member = await demoUser('member');
  const keyGrip = await demoUser('moderator');
  if (await Kit.findOne({ where: { ownerId: member.id, name: KIT_NAME } })) return;

  const yoke = await shelfPart('Dashboard monitor yoke', 'ASA');
  const spacer = await shelfPart('V-style plate spacer, 6 mm', 'PETG');
  const cradle = await shelfPart('Receiver cradle for 15 mm rods', 'PETG');

  await transact(sequelize, async (transaction) => {
    const cart = await Printer.create(
      {
        ownerId: member.id,
        name: 'Cart printer',
        bedXMm: 220,
        bedYMm: 220,
        bedZMm: 250,
        nozzleMm: 0.4,
        watts: 120,
        notes: 'Rides on the camera cart; enclosure panels in the blue case.',
      },
      { transaction },
    );
    const bigBox = await Printer.create(
      {
        ownerId: member.id,
        name: 'Big box',
        bedXMm: 300,
        bedYMm: 300,
        bedZMm: 300,
        nozzleMm: 0.4,
        watts: 350,
        notes: 'Stays at the unit base; enclosed, for ASA and ABS.',
      },
      { transaction },
    );
    await PriceSheet.upsert({ userId: member.id, pricesPerKg: { PLA: 21, PETG: 24, ASA: 30 }, pricePerKwh: 0.32 }, { transaction });

    const kit = await Kit.create(
      {
        ownerId: member.id,
        name: KIT_NAME,
        production: 'The Salt Road',
        startsOn: '2026-04-13',
        endsOn: '2026-04-24',
        locationNotes: 'Desert highway driving scenes: picture car on a low loader, monitor on the dashboard, sun on the windscreen from mid-morning.',
        heatExposure: 'vehicle-sun',
        printHoursPerDay: 8,
        printerPrice: 480,
      },
      { transaction },
    );
    const items = [
      { ...yoke, quantity: 2, material: null, printerId: bigBox.id, boughtPriceEach: 38, servicePriceEach: 16, serviceShipping: 9 },
      // printed in PLA to save time: the summary warns that it will soften on the dashboard
      { ...spacer, quantity: 2, material: 'PLA' as const, printerId: cart.id, boughtPriceEach: 24, servicePriceEach: null, serviceShipping: null },
      { ...cradle, quantity: 3, material: null, printerId: cart.id, boughtPriceEach: 19, servicePriceEach: 8, serviceShipping: 6 },
    ];
    await KitItem.bulkCreate(
      items.map((item, position) => ({
        kitId: kit.id,
        partId: item.part.id,
        position,
        quantity: item.quantity,
        recipeId: item.recipe.id,
        material: item.material,
        printerId: item.printerId,
        boughtPriceEach: item.boughtPriceEach,
        servicePriceEach: item.servicePriceEach,
        serviceShipping: item.serviceShipping,
      })),
      { transaction },
    );
    await KitShare.create({ kitId: kit.id, userId: keyGrip.id, access: 'read' }, { transaction });
  });
};
