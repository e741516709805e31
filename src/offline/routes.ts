// Which answers the service worker keeps for use with no signal (shared by src/sw.ts and the app).

export const OFFLINE_CACHE = 'rigshelf-offline-v1';
export const OFFLINE_IMAGE_CACHE = 'rigshelf-offline-images-v1';
/** Set on a stored copy only: when it was stored. A live answer never carries it. */
export const STORED_AT_HEADER = 'x-rigshelf-stored-at';

const KEPT: RegExp[] = [
  /^\/api\/auth\/me$/,
  /^\/api\/kits$/,
  /^\/api\/kits\/\d+$/,
  /^\/api\/kits\/\d+\/(summary|recalls)$/,
  /^\/api\/printers$/,
  /^\/api\/me\/prices$/,
  /^\/api\/vocab(\/[a-z-]+)?$/,
  /^\/api\/parts\/[^/]+$/,
  /^\/api\/parts\/[^/]+\/(proven|ratings|reports|history)$/,
];

export function keepsOfflineCopy(pathname: string): boolean {
  return KEPT.some((re) => re.test(pathname));
}

export function keepsOfflineImage(pathname: string): boolean {
  return (
    /^\/api\/parts\/[^/]+\/files\/\d+\/image\/(thumb|display)$/.test(pathname) ||
    /^\/api\/parts\/[^/]+\/reports\/\d+\/photos\/\d+\/(thumb|display)$/.test(pathname)
  );
}
