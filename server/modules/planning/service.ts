// Prep days: print estimates, a member's printers and filament prices, and shoot kits (what to print
// for a shoot, on which printer, and whether it survives the shoot), one file per concern:
// estimate.ts, printers.ts, prices.ts, kits.ts, items.ts, shares.ts, summary.ts (with the CSV).
import type { Sequelize } from 'sequelize';
import type { EvidenceService } from '../evidence/service';
import type { FileStorage } from '../files/storage';
import type { Alerts } from '../notices/alerts';
import { estimateService } from './estimate';
import { itemService } from './items';
import { kitService } from './kits';
import { printerService } from './printers';
import { priceService } from './prices';
import { shareService } from './shares';
import type { SliceQueue } from './slice-queue';
import { summaryService } from './summary';

export interface PlanningDeps {
  sequelize: Sequelize;
  /** Where stored model files live, for slicing them. */
  storage: FileStorage;
  /** Slices model files in a worker thread. */
  slicer: SliceQueue;
  /** Outcome warnings from set reports, per part. */
  evidence: Pick<EvidenceService, 'evidenceFor'>;
  /** Tells a member a kit was shared with them (bell and mail, as their settings allow). */
  alerts?: Alerts;
}

export function createPlanningService(deps: PlanningDeps) {
  return {
    ...estimateService(deps),
    ...printerService(deps),
    ...priceService(),
    ...kitService(deps),
    ...itemService(deps),
    ...shareService(deps),
    ...summaryService(deps),
  };
}

export type PlanningService = ReturnType<typeof createPlanningService>;
