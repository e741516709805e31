// Limits and choices the forms show before any checking happens. They live apart from the zod
// schemas (which import them) so a page can print them without loading zod.

export const RECIPE_PURPOSES = ['fit-test', 'set-ready'] as const;
export const INFILL_PATTERNS = ['grid', 'lines', 'triangles', 'gyroid', 'honeycomb', 'cubic', 'concentric'] as const;
export const SUPPORT_MODES = ['none', 'bed-only', 'everywhere'] as const;

/** Layers thicker than about 80 % of the nozzle bond poorly (common practice). */
export const MAX_LAYER_TO_NOZZLE = 0.8;

export const MAX_WANTED_PHOTOS = 3;

export const MAX_REQUEST_QUANTITY = 50;
export const MAX_STATEMENT_FEES = 20;

/** Print settings a made part is planned with unless the member picks others (common practice for sturdy small parts). */
export const MADE_PART_RECIPE = { nozzleMm: 0.4, layerMm: 0.2, walls: 4, topBottomLayers: 5, infillPct: 40, speedMmS: 60 } as const;
