import { z as zod } from 'zod';

// kept apart so the client's forms can show messages without loading zod with the page
export { fieldErrors } from './field-errors';

/** A boolean that also accepts the strings form fields carry ("true", "1", "on", …). */
export const boolish = zod
  .union([zod.boolean(), zod.enum(['true', 'false', '1', '0', 'on', 'off', 'yes', 'no', ''])])
  .transform((v) => v === true || v === 'true' || v === '1' || v === 'on' || v === 'yes');
