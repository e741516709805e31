// Keeps track of photo cleaning that is under way, whoever asked for it (parts or set reports), so
// tests and shutdown can wait until every photo is done.
import { cleanPhoto } from '../parts/part-files';
import type { PhotoQueue } from './photo-queue';
import type { UploadDirs } from './storage';

type Row = Parameters<typeof cleanPhoto>[2];
type Reload = Parameters<typeof cleanPhoto>[3];

export class PhotoJobs {
  private inFlight = new Set<Promise<void>>();

  constructor(
    private readonly dirs: UploadDirs,
    private readonly queue: PhotoQueue,
  ) {}

  clean(row: Row, reload: Reload): void {
    const job: Promise<void> = cleanPhoto(this.dirs, this.queue, row, reload)
      .catch((err) => console.error(`photo ${row.storedName} could not be cleaned:`, err))
      .finally(() => this.inFlight.delete(job));
    this.inFlight.add(job);
  }

  async settled(): Promise<void> {
    while (this.inFlight.size) await Promise.all([...this.inFlight]);
  }

  async close(): Promise<void> {
    await this.settled();
    await this.queue.close();
  }
}
