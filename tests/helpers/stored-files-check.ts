// Which stored files the rows call for, and which keys no row claims: the orphan check of the chaos
// run, for either storage driver (give it the keys listed under incoming/ and store/).

export interface FileRows {
  /** part_files: kind, stored name, photo processing state, model picture state. */
  partFiles: { kind: string; storedName: string; processing: string; renderStatus: string | null }[];
  /** report_photos and wanted_photos. */
  photos: { storedName: string; processing: string }[];
}

export function checkStoredFiles(rows: FileRows, keys: string[]): { missing: string[]; unclaimed: string[] } {
  const present = new Set(keys);
  const expected = new Set<string>();
  const expectedIncoming = new Set<string>();
  // a photo still waiting (cleaning cut off by shutdown) may already have its sizes written; the
  // next start cleans it again over them, so they belong to its row; likewise a model's picture
  const pendingSizes = new Set<string>();
  const sizes = (name: string) => [`store/${name}-display.jpg`, `store/${name}-thumb.jpg`];
  const expectPhoto = (name: string, processing: string) => {
    if (processing === 'ready') sizes(name).forEach((k) => expected.add(k));
    else if (processing === 'pending') {
      expectedIncoming.add(`incoming/${name}`);
      sizes(name).forEach((k) => pendingSizes.add(k));
    }
  };
  for (const f of rows.partFiles) {
    if (f.kind === 'photo') expectPhoto(f.storedName, f.processing);
    else expected.add(`store/${f.storedName}`);
    if (f.kind === 'model' && f.renderStatus === 'ready') sizes(f.storedName).forEach((k) => expected.add(k));
    else if (f.kind === 'model' && f.renderStatus === 'pending') sizes(f.storedName).forEach((k) => pendingSizes.add(k));
  }
  for (const p of rows.photos) expectPhoto(p.storedName, p.processing);
  return {
    missing: [
      ...[...expected].filter((k) => !present.has(k)).map((k) => `${k} (row without its file)`),
      ...[...expectedIncoming].filter((k) => !present.has(k)).map((k) => `${k} (pending row without its file)`),
    ],
    unclaimed: keys
      .filter((k) => !expected.has(k) && !expectedIncoming.has(k) && !pendingSizes.has(k))
      .map((k) => `${k} (${k.startsWith('incoming/') ? 'no pending row' : 'no row'})`),
  };
}
