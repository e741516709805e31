// Which currency a member's prices are in. Nothing is converted: a kit's costs are shown in the
// currency of the price sheet they were worked out with (the kit owner's).

/** Until a member picks one; the typical filament prices (docs/sources.md) are written in it. */
export const DEFAULT_CURRENCY = 'EUR';

/** Offered first in the price form; any ISO 4217 code the runtime knows is accepted. */
export const COMMON_CURRENCIES = ['EUR', 'USD', 'GBP', 'CAD', 'AUD', 'NZD', 'CHF', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK', 'JPY', 'ZAR', 'INR'] as const;

export function isCurrency(code: string): boolean {
  if (!/^[A-Z]{3}$/.test(code)) return false;
  const known = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('currency') : COMMON_CURRENCIES;
  return (known as readonly string[]).includes(code);
}
