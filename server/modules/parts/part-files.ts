// Turning inspected uploads, already placed, into file rows inside the caller's transaction; the sweep of files without rows.
import { join } from 'node:path';
import { imageSize } from 'image-size';
import { Op, type Transaction } from 'sequelize';
import { PartFile, ReportPhoto, RevisionFile, WantedPhoto } from '../../db/models';
import type { InspectedFile } from '../files/inspect';
import { filesOlderThan, removeLocal, removeQuietly, type FileStorage } from '../files/storage';
import { keysOf, storedNameOf } from '../files/stored-files';

const KIND = { model: 'model', photo: 'photo', source: 'source' } as const;

/** What a part's upload is stored as, from the form field it came in. */
export function fileKind(file: InspectedFile): PartFile['kind'] {
  return KIND[file.field];
}

/**
 * Creates the rows of uploads already placed under `names` (stageUploads) and links them to the
 * revision after its existing files. Returns the new rows (photos among them wait to be cleaned).
 */
export async function attachFiles(
  options: { partId: number; revisionId: number; createdBy: number; files: InspectedFile[]; names: string[] },
  transaction: Transaction,
): Promise<PartFile[]> {
  const { partId, revisionId, createdBy, files, names } = options;
  const start = ((await RevisionFile.max<number, RevisionFile>('position', { where: { revisionId }, transaction })) ?? -1) + 1;
  const rows: PartFile[] = [];
  for (const [i, file] of files.entries()) {
    const kind = fileKind(file);
    const row = await PartFile.create(
      {
        partId,
        kind,
        storedName: names[i],
        originalName: file.originalName,
        mime: kind === 'photo' ? 'image/jpeg' : file.mime,
        sizeBytes: file.size,
        sha256: file.sha256,
        format: file.analysis?.format ?? file.type,
        analysis: file.analysis,
        processing: kind === 'photo' ? 'pending' : 'ready',
        renderStatus: kind === 'model' ? 'pending' : null,
        width: null,
        height: null,
        createdBy,
      },
      { transaction },
    );
    await RevisionFile.create({ revisionId, fileId: row.id, position: start + i }, { transaction });
    rows.push(row);
  }
  return rows;
}

export async function removeStoredFiles(storage: FileStorage, row: Pick<PartFile, 'kind' | 'storedName'>) {
  const k = keysOf(row);
  await removeQuietly(storage, k.original, k.display, k.thumbnail);
}

/**
 * Start-up sweep after a crash: drops unfinished uploads, raw photos nobody is waiting for and stored
 * files no row refers to (a model's pictures go with the model's row). Stored files younger than
 * `minAgeMs` are left alone: with several instances on one bucket, another may be about to commit
 * their rows. Returns the photos still waiting to be cleaned and the models still waiting for their picture.
 */
export async function sweepUploads(
  storage: FileStorage,
  /** `tmpMinAgeMs`: the same for unfinished uploads in the temp folder, which instances may share on one disk. */
  options: { minAgeMs?: number; tmpMinAgeMs?: number } = {},
): Promise<{ removed: number; pendingPhotos: PartFile[]; pendingReportPhotos: ReportPhoto[]; pendingWantedPhotos: WantedPhoto[]; pendingRenders: PartFile[] }> {
  const minAgeMs = options.minAgeMs ?? 0;
  let removed = 0;
  const tmp = await filesOlderThan(storage.tmp, options.tmpMinAgeMs ?? 0);
  await removeLocal(...tmp.map((name) => join(storage.tmp, name)));
  removed += tmp.length;
  const drop = async (keys: string[]) => {
    for (let i = 0; i < keys.length; i += 500) await removeQuietly(storage, ...keys.slice(i, i + 500));
    removed += keys.length;
  };
  const now = Date.now();
  const settled = (o: { modified: Date }) => now - o.modified.getTime() >= minAgeMs;

  const pendingPhotos = await PartFile.findAll({ where: { kind: 'photo', processing: 'pending' } });
  const pendingReportPhotos = await ReportPhoto.findAll({ where: { processing: 'pending' } });
  const pendingWantedPhotos = await WantedPhoto.findAll({ where: { processing: 'pending' } });
  const waiting = new Set([...pendingPhotos, ...pendingReportPhotos, ...pendingWantedPhotos].map((p) => p.storedName));
  const incoming = (await storage.list('incoming/')).filter(settled);
  await drop(incoming.filter((o) => !waiting.has(storedNameOf(o.key))).map((o) => o.key));

  const stored = (await storage.list('store/')).filter(settled);
  const names = [...new Set(stored.map((o) => storedNameOf(o.key)))];
  const known = new Set<string>();
  for (let i = 0; i < names.length; i += 1000) {
    const where = { storedName: { [Op.in]: names.slice(i, i + 1000) } };
    for (const model of [PartFile, ReportPhoto, WantedPhoto] as const) {
      for (const f of await (model as typeof PartFile).findAll({ where, attributes: ['storedName'] })) known.add(f.storedName);
    }
  }
  await drop(stored.filter((o) => !known.has(storedNameOf(o.key))).map((o) => o.key));
  const stillRaw = async <T extends WaitingPhoto>(rows: T[]) => {
    const raw: T[] = [];
    for (const row of rows) if (await settleWithoutRaw(storage, row)) raw.push(row);
    return raw;
  };
  // models waiting for their picture (new ones cut off by a stop, and existing ones after migration 0014)
  const pendingRenders = await PartFile.findAll({ where: { kind: 'model', renderStatus: 'pending' }, order: [['id', 'ASC']] });
  return {
    removed,
    pendingRenders,
    pendingPhotos: await stillRaw(pendingPhotos),
    pendingReportPhotos: await stillRaw(pendingReportPhotos),
    pendingWantedPhotos: await stillRaw(pendingWantedPhotos),
  };
}

type WaitingPhoto = Pick<PartFile, 'storedName'> & { update(values: { processing: 'ready' | 'failed'; width?: number; height?: number }): Promise<unknown> };

/**
 * A waiting photo whose raw upload is gone was cut off between its last steps: with both sizes written
 * it is ready (its recorded size is then the display size, same proportions), otherwise it failed.
 * Returns true when the raw upload is there and the photo can be cleaned again.
 */
async function settleWithoutRaw(storage: FileStorage, row: WaitingPhoto): Promise<boolean> {
  const k = keysOf({ kind: 'photo', storedName: row.storedName });
  if (await storage.exists(k.original)) return true;
  const display = await storage.get(k.display!);
  if (display && (await storage.exists(k.thumbnail!))) {
    const size = imageSize(display);
    await row.update({ processing: 'ready', width: size.width, height: size.height });
  } else {
    await removeQuietly(storage, k.display, k.thumbnail);
    await row.update({ processing: 'failed' });
  }
  return false;
}
