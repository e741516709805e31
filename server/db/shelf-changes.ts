// The shelf's change log (table shelf_changes): every write to what search shows adds a row in the
// same transaction as the write, so it exists exactly when the change committed. Each app instance
// polls it (search/service.ts) and rebuilds its own in-memory index when it moved. 'index' rows are
// for the text index (parts, revisions, their files, camera bodies), 'ranking' rows for ratings,
// set reports and their flags. Raw queries (job claims, leases) add nothing: they change no result.
import { QueryTypes, type Model, type ModelStatic, type Transaction } from 'sequelize';

export type ShelfChangeKind = 'index' | 'ranking';

interface HookOptions {
  transaction?: Transaction | null;
  fields?: (string | number | symbol)[];
}

/** Models whose rows feed search, and the attributes that matter (all when not listed). */
export interface WatchedModel {
  model: ModelStatic<Model>;
  kind: ShelfChangeKind;
  only?: string[];
  /** A new row changes nothing search shows (drafts, files of a revision in review): not logged. */
  skipCreate?: boolean;
  /** For single-row updates: whether this row's change can show in search (e.g. it is published). */
  when?: (row: Model, changed: string[]) => boolean;
}

async function record(model: ModelStatic<Model>, kind: ShelfChangeKind, transaction?: Transaction | null) {
  await model.sequelize!.query('INSERT INTO shelf_changes (kind, created_at) VALUES (:kind, NOW(3))', {
    replacements: { kind },
    type: QueryTypes.INSERT,
    transaction: transaction ?? undefined,
  });
}

/** Adds the hooks (again after each Model.init, which resets a model's hooks). */
export function logShelfChanges(watched: WatchedModel[]): void {
  for (const { model, kind, only, skipCreate, when } of watched) {
    const touches = (fields: HookOptions['fields']) => !only || !fields || fields.some((f) => only.includes(String(f)));
    if (!skipCreate) {
      model.addHook('afterCreate', 'shelfChanges', (_row: Model, options: HookOptions) => record(model, kind, options.transaction));
      model.addHook('afterBulkCreate', 'shelfChanges', (_rows: Model[], options: HookOptions) => record(model, kind, options.transaction));
    }
    model.addHook('afterDestroy', 'shelfChanges', (_row: Model, options: HookOptions) => record(model, kind, options.transaction));
    model.addHook('afterBulkDestroy', 'shelfChanges', (options: HookOptions) => record(model, kind, options.transaction));
    model.addHook('afterUpdate', 'shelfChanges', (row: Model, options: HookOptions) => {
      const changed = row.changed() || [];
      if (only && !changed.some((f) => only.includes(f))) return;
      if (when && !when(row, changed)) return;
      return record(model, kind, options.transaction);
    });
    model.addHook('afterBulkUpdate', 'shelfChanges', (options: HookOptions) =>
      touches(options.fields) ? record(model, kind, options.transaction) : undefined,
    );
  }
}
