import { ref } from 'vue';
import type { z } from 'zod';
import { fieldErrors } from '@shared/field-errors';
import { isApiError } from '@/api';

/** Inline field messages from the shared schema (before sending) or from the server's 422. */
export function useFormErrors() {
  const errors = ref<Record<string, string>>({});

  function check<S extends z.ZodType>(schema: S, value: unknown): z.output<S> | null {
    const result = schema.safeParse(value);
    errors.value = result.success ? {} : fieldErrors(result.error);
    return result.success ? result.data : null;
  }

  /** Takes the server's field messages; returns false when the error had none. */
  function fromServer(err: unknown): boolean {
    if (isApiError(err) && Object.keys(err.fields).length) {
      errors.value = err.fields;
      return true;
    }
    return false;
  }

  return { errors, check, fromServer };
}
