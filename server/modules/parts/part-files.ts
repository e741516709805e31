// Turning inspected uploads into file rows and files in place, inside the caller's transaction.
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { Op, type Transaction } from 'sequelize';
import { PartFile, ReportPhoto, RevisionFile, WantedPhoto } from '../../db/models';
import type { InspectedFile } from '../files/inspect';
import type { PhotoQueue } from '../files/photo-queue';
import { filesOlderThan, moveAll, randomStoredName, removeQuietly, type UploadDirs } from '../files/storage';

export interface StoredPaths {
  /** Models and sources: the file itself. Photos: the raw upload until it is cleaned. */
  original: string;
  display?: string;
  thumbnail?: string;
}

export function pathsOf(dirs: UploadDirs, file: Pick<PartFile, 'kind' | 'storedName'>): StoredPaths {
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

/** A row holding a photo (a part's or a set report's), reloaded after cleaning in case it was deleted meanwhile. */
interface PhotoRow {
  storedName: string;
}
type Reload = () => Promise<{ update(values: { processing: 'ready' | 'failed'; width?: number; height?: number }): Promise<unknown> } | null>;

/** Cleans a stored photo in the worker and records the outcome; the raw upload is removed either way. */
export async function cleanPhoto(dirs: UploadDirs, photos: PhotoQueue, row: PhotoRow, reload: Reload): Promise<void> {
  const paths = pathsOf(dirs, { kind: 'photo', storedName: row.storedName });
  const result = await photos.process({ source: paths.original, display: paths.display!, thumbnail: paths.thumbnail! });
  await removeQuietly(paths.original);
  const stillThere = await reload();
  if (!stillThere) {
    await removeQuietly(paths.display, paths.thumbnail);
    return;
  }
  if (result.ok) await stillThere.update({ processing: 'ready', width: result.width, height: result.height });
  else {
    await removeQuietly(paths.display, paths.thumbnail);
    await stillThere.update({ processing: 'failed' });
  }
}

export async function removeStoredFiles(dirs: UploadDirs, row: Pick<PartFile, 'kind' | 'storedName'>) {
  const p = pathsOf(dirs, row);
  await removeQuietly(p.original, p.display, p.thumbnail);
}

/**
 * Start-up sweep after a crash: drops unfinished uploads, raw photos nobody is waiting for and stored
 * files no row refers to. Returns the photos still waiting to be cleaned.
 */
export async function sweepUploads(dirs: UploadDirs): Promise<{ removed: number; pendingPhotos: PartFile[]; pendingReportPhotos: ReportPhoto[]; pendingWantedPhotos: WantedPhoto[] }> {
  let removed = 0;
  const drop = async (path: string) => {
    await removeQuietly(path);
    removed += 1;
  };
  for (const name of await filesOlderThan(dirs.tmp, 0)) await drop(join(dirs.tmp, name));

  const pendingPhotos = await PartFile.findAll({ where: { kind: 'photo', processing: 'pending' } });
  const pendingReportPhotos = await ReportPhoto.findAll({ where: { processing: 'pending' } });
  const pendingWantedPhotos = await WantedPhoto.findAll({ where: { processing: 'pending' } });
  const waiting = new Set([...pendingPhotos, ...pendingReportPhotos, ...pendingWantedPhotos].map((p) => p.storedName));
  for (const name of await filesOlderThan(dirs.incoming, 0)) if (!waiting.has(name)) await drop(join(dirs.incoming, name));

  const stored = await filesOlderThan(dirs.store, 0);
  const baseOf = (name: string) => name.replace(/-(display|thumb)\.jpg$/, '');
  const names = { storedName: { [Op.in]: [...new Set(stored.map(baseOf))] } };
  const known = new Set([
    ...(await PartFile.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
    ...(await ReportPhoto.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
    ...(await WantedPhoto.findAll({ where: names, attributes: ['storedName'] })).map((f) => f.storedName),
  ]);
  for (const name of stored) if (!known.has(baseOf(name))) await drop(join(dirs.store, name));
  const stillRaw = <T extends { storedName: string }>(rows: T[]) => rows.filter((p) => existsSync(pathsOf(dirs, { kind: 'photo', storedName: p.storedName }).original));
  return { removed, pendingPhotos: stillRaw(pendingPhotos), pendingReportPhotos: stillRaw(pendingReportPhotos), pendingWantedPhotos: stillRaw(pendingWantedPhotos) };
}
