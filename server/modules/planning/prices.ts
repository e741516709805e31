// A member's filament and electricity prices (their price sheet).
import type { PriceSheetInfo } from '@shared/api/planning';
import type { PriceSheetInput } from '@shared/schemas/planning';
import { PriceSheet, type User } from '../../db/models';
import { presentPriceSheet } from './presenter';

export function priceService() {
  return {
    async prices(user: User): Promise<PriceSheetInfo> {
      return presentPriceSheet(await PriceSheet.findByPk(user.id));
    },

    /** Replaces the member's prices: materials not named go back to the default. */
    async setPrices(user: User, input: PriceSheetInput): Promise<PriceSheetInfo> {
      const current = await PriceSheet.findByPk(user.id);
      await PriceSheet.upsert({
        userId: user.id,
        pricesPerKg: input.prices,
        pricePerKwh: input.pricePerKwh ?? null,
        machineHourRate: input.machineHourRate !== undefined ? input.machineHourRate : (current?.machineHourRate ?? null),
        ...(input.currency ? { currency: input.currency } : {}),
      });
      return presentPriceSheet(await PriceSheet.findByPk(user.id));
    },
  };
}
