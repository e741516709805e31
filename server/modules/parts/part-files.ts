// Turning inspected uploads into file rows and files in place, inside the caller's transaction.
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { imageSize } from 'image-size';
import { Op, type Transaction } from 'sequelize';
import { PartFile, ReportPhoto, RevisionFile, WantedPhoto } from '../../db/models';
import type { InspectedFile } from '../files/inspect';
import { filesOlderThan, moveAll, randomStoredName, removeQuietly, type UploadDirs } from '../files/storage';

export interface StoredPaths {
  /** Models and sources: the file itself. Photos: the raw upload until it is cleaned. */
  original: string;
  /** Photos: the cleaned sizes. Models: the shaded preview picture (render-model.ts). */
  display?: string;
  thumbnail?: string;
}

export function pathsOf(dirs: UploadDirs, file: Pick<PartFile, 'kind' | 'storedName'>): StoredPaths {
  if (file.kind === 'model') {
    return {
      original: join(dirs.store, file.storedName),
      display: join(dirs.store, `${file.storedName}-display.jpg`),
      thumbnail: join(dirs.store, `${file.storedName}-thumb.jpg`),
    };
  }
  if (file.kind !== 'photo') return { original: join(dirs.store, file.storedName) };
  return {
    original: join(dirs.incoming, file.storedName),
    display: join(dirs.store, `${file.storedName}-display.jpg`),
    thumbnail: join(dirs.store, `${file.storedName}-thumb.jpg`),
  };
}

const KIND = { model: 'model', photo: 'photo', source: 'source' } as const;

/**
 * Creates the rows, links them to the revision after its existing files, and moves the files into
 * place. Returns an undo for the moves (call it if the transaction fails) and the new photo rows.
 */
export async function attachFiles(
  options: { dirs: UploadDirs; partId: number; revisionId: number; createdBy: number; files: InspectedFile[] },
  transaction: Transaction,
) {
  const { dirs, partId, revisionId, createdBy, files } = options;
  const start = ((await RevisionFile.max<number, RevisionFile>('position', { where: { revisionId }, transaction })) ?? -1) + 1;
  const rows: PartFile[] = [];
  const moves: { from: string; to: string }[] = [];
  for (const [i, file] of files.entries()) {
    const kind = KIND[file.field];
    const storedName = kind === 'photo' ? randomStoredName('') : randomStoredName(file.extension);
    const row = await PartFile.create(
      {
        partId,
        kind,
        storedName,
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
    moves.push({ from: file.path, to: pathsOf(dirs, row).original });
  }
  const moved = await moveAll(moves);
  return { rows, undo: () => moved.undo() };
}

export async function removeStoredFiles(dirs: UploadDirs, row: Pick<PartFile, 'kind' | 'storedName'>) {
  const p = pathsOf(dirs, row);
  await removeQuietly(p.original, p.display, p.thumbnail);
}

/**
 * Start-up sweep after a crash: drops unfinished uploads, raw photos nobody is waiting for and stored
 * files no row refers to (a model's pictures go with the model's row). Returns the photos still waiting
 * to be cleaned and the models still waiting for their picture.
 */
export async function sweepUploads(
  dirs: UploadDirs,
  /** Only files untouched for this long are removed (another instance may be writing newer ones). */
  minAgeMs = 0,
): Promise<{ removed: number; pendingPhotos: PartFile[]; pendingReportPhotos: ReportPhoto[]; pendingWantedPhotos: WantedPhoto[]; pendingRenders: PartFile[] }> {
  let removed = 0;
  const drop = async (path: string) => {
    await removeQuietly(path);
    removed += 1;
  };
  for (const name of await filesOlderThan(dirs.tmp, minAgeMs)) await drop(join(dirs.tmp, name));

  const pendingPhotos = await PartFile.findAll({ where: { kind: 'photo', processing: 'pending' } });
  const pendingReportPhotos = await ReportPhoto.findAll({ where: { processing: 'pending' } });
  const pendingWantedPhotos = await WantedPhoto.findAll({ where: { processing: 'pending' } });
  const waiting = new Set([...pendingPhotos, ...pendingReportPhotos, ...pendingWantedPhotos].map((p) => p.storedName));
  for (const name of await filesOlderThan(dirs.incoming, minAgeMs)) if (!waiting.has(name)) await drop(join(dirs.incoming, name));

  const stored = await filesOlderThan(dirs.store, minAgeMs);
  const baseOf = (name: string) => name.replace(/-(display|thumb)\.jpg$/, '');
  const names = { storedName: { [Op.in]: [...new Set(stored.map(baseOf))] } };
  const known = new Set([
    ...(await PartFile.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
    ...(await ReportPhoto.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
    ...(await WantedPhoto.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
  ]);
  for (const name of stored) if (!known.has(baseOf(name))) await drop(join(dirs.store, name));
  const stillRaw = async <T extends WaitingPhoto>(rows: T[]) => {
    const raw: T[] = [];
    for (const row of rows) if (await settleWithoutRaw(dirs, row)) raw.push(row);
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
async function settleWithoutRaw(dirs: UploadDirs, row: WaitingPhoto): Promise<boolean> {
  const p = pathsOf(dirs, { kind: 'photo', storedName: row.storedName });
  if (existsSync(p.original)) return true;
  if (existsSync(p.display!) && existsSync(p.thumbnail!)) {
    const size = imageSize(await readFile(p.display!));
    await row.update({ processing: 'ready', width: size.width, height: size.height });
  } else {
    await removeQuietly(p.display!, p.thumbnail!);
    await row.update({ processing: 'failed' });
  }
  return false;
}
