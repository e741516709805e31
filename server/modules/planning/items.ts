// A kit's items: parts from the shelf with a published recipe, on one of the kit owner's printers.
import type { Transaction } from 'sequelize';
import type { KitItemInfo } from '@shared/api/planning';
import { MAX_KIT_ITEMS, type KitItemInput, type KitItemPatch } from '@shared/schemas/planning';
import { Kit, KitItem, Part, Printer, Recipe, type User } from '../../db/models';
import { transact } from '../../db/transaction';
import { AppError } from '../../errors';
import { answerOfFirst, rememberKey, replayOf } from '../evidence/client-keys';
import { audienceOf, crewAllows } from '../parts/access';
import { findKit } from './access';
import { touchKit } from './kits';
import { isOnShelfForKits, loadItems, presentItem } from './presenter';
import type { PlanningDeps } from './service';
import { defined } from './values';

/** A part that can go in a kit: on the shelf now. Missing and unpublished parts get the same answer. */
async function shelfPart(viewer: User, partId: number, transaction?: Transaction): Promise<Part> {
  const part = await Part.findByPk(partId, { transaction });
  if (!part || !isOnShelfForKits(part) || !crewAllows(await audienceOf(viewer, transaction), part)) {
    throw AppError.field('partId', 'Only parts that are on the shelf can go in a kit; that one is not. Pick a part from the shelf.');
  }
  return part;
}

/** The default is the first set-ready recipe, else the first recipe. */
export function defaultRecipe(recipes: Recipe[]): Recipe | null {
  return recipes.find((r) => r.purpose === 'set-ready') ?? recipes[0] ?? null;
}

async function publishedRecipe(part: Part, recipeId: number | null | undefined, transaction?: Transaction): Promise<Recipe> {
  if (recipeId) {
    const recipe = await Recipe.findOne({ where: { id: recipeId, revisionId: part.publishedRevisionId! }, transaction });
    if (!recipe) throw AppError.field('recipeId', 'That recipe is not one of this part’s published recipes; pick one from the part’s page.');
    return recipe;
  }
  const recipes = await Recipe.findAll({ where: { revisionId: part.publishedRevisionId! }, order: [['position', 'ASC']], transaction });
  const recipe = defaultRecipe(recipes);
  if (!recipe) throw AppError.field('recipeId', 'This part has no published recipe to print it with.');
  return recipe;
}

async function ownersPrinter(kit: Kit, printerId: number | null | undefined, transaction?: Transaction): Promise<number | null> {
  if (printerId === null || printerId === undefined) return null;
  const printer = await Printer.findOne({ where: { id: printerId, ownerId: kit.ownerId }, transaction });
  if (!printer) throw AppError.field('printerId', 'That printer is not one of the kit owner’s printers; pick one of theirs or none.');
  return printer.id;
}

/** An item of the kit; one whose part is published to a crew the viewer is not in is not there for them. */
async function itemOf(kit: Kit, itemId: number, transaction?: Transaction, viewer?: User): Promise<KitItem> {
  const item = await KitItem.findOne({ where: { id: itemId, kitId: kit.id }, transaction });
  const part = item?.partId && viewer ? await Part.findByPk(item.partId, { attributes: ['id', 'crewId', 'authorId'], transaction }) : null;
  if (!item || (part && !crewAllows(await audienceOf(viewer, transaction), part))) throw AppError.notFound('There is no item with that id in this kit.');
  return item;
}

async function presentedItem(kitId: number, id: number): Promise<KitItemInfo> {
  const [item] = await loadItems(kitId, id);
  return presentItem(item);
}

export function itemService({ sequelize }: Pick<PlanningDeps, 'sequelize'>) {
  return {
    /** With an Idempotency-Key, sending the same item again (its answer was lost) adds nothing and answers the first one. */
    async addItem(viewer: User, kitId: number, input: KitItemInput, clientKey?: string): Promise<KitItemInfo> {
      const scope = `kit-item:${kitId}`;
      const id = await transact(sequelize, async (t) => {
        if (clientKey) {
          const seen = await replayOf<{ id: number }>(viewer.id, clientKey, scope, t);
          if (seen) return seen.id;
        }
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        if ((await KitItem.count({ where: { kitId: kit.id }, transaction: t })) >= MAX_KIT_ITEMS) {
          throw AppError.conflict(`A kit holds at most ${MAX_KIT_ITEMS} items; split it into two kits.`);
        }
        const part = await shelfPart(viewer, input.partId, t);
        const recipe = await publishedRecipe(part, input.recipeId, t);
        const printerId = await ownersPrinter(kit, input.printerId, t);
        const last = (await KitItem.max<number, KitItem>('position', { where: { kitId: kit.id }, transaction: t })) ?? -1;
        const item = await KitItem.create(
          {
            kitId: kit.id,
            partId: part.id,
            position: last + 1,
            quantity: input.quantity,
            recipeId: recipe.id,
            material: input.material ?? null,
            printerId,
            boughtPriceEach: input.boughtPriceEach ?? null,
            servicePriceEach: input.servicePriceEach ?? null,
            serviceShipping: input.serviceShipping ?? null,
          },
          { transaction: t },
        );
        await touchKit(kit, t);
        if (clientKey) await rememberKey(viewer.id, clientKey, scope, { id: item.id }, t);
        return item.id;
      }).catch(async (err: unknown) => (await answerOfFirst<{ id: number }>(err, viewer.id, clientKey, scope)).id);
      return presentedItem(kitId, id);
    },

    async updateItem(viewer: User, kitId: number, itemId: number, patch: KitItemPatch): Promise<KitItemInfo> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        const item = await itemOf(kit, itemId, t, viewer);
        if (!item.partId && (patch.partId !== undefined || patch.recipeId !== undefined)) {
          throw AppError.field(
            patch.partId !== undefined ? 'partId' : 'recipeId',
            'A made item keeps its maker and sizes; make it again and add the new one instead.',
          );
        }
        const changes: Partial<KitItem> = defined({
          quantity: patch.quantity,
          material: patch.material,
          boughtPriceEach: patch.boughtPriceEach,
          servicePriceEach: patch.servicePriceEach,
          serviceShipping: patch.serviceShipping,
        });
        if (patch.partId !== undefined && patch.partId !== item.partId) {
          const part = await shelfPart(viewer, patch.partId, t);
          changes.partId = part.id;
          changes.recipeId = (await publishedRecipe(part, patch.recipeId, t)).id;
        } else if (patch.recipeId !== undefined) {
          // null goes back to the part's default recipe
          changes.recipeId = (await publishedRecipe(await shelfPart(viewer, item.partId!, t), patch.recipeId, t)).id;
        }
        if (patch.printerId !== undefined) changes.printerId = await ownersPrinter(kit, patch.printerId, t);
        await item.update(changes, { transaction: t });
        await touchKit(kit, t);
      });
      return presentedItem(kitId, itemId);
    },

    async deleteItem(viewer: User, kitId: number, itemId: number): Promise<void> {
      await transact(sequelize, async (t) => {
        const { kit } = await findKit(viewer, kitId, 'edit', undefined, t);
        const item = await itemOf(kit, itemId, t, viewer);
        await item.destroy({ transaction: t });
        await touchKit(kit, t);
      });
    },
  };
}
