import { z as zod } from 'zod';

/** Turns zod issues into one message per field ("_" for the whole object), as both sides show them. */
export function fieldErrors(error: zod.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

/** A boolean that also accepts the strings form fields carry ("true", "1", "on", …). */
export const boolish = zod
  .union([zod.boolean(), zod.enum(['true', 'false', '1', '0', 'on', 'off', 'yes', 'no', ''])])
  .transform((v) => v === true || v === 'true' || v === '1' || v === 'on' || v === 'yes');
