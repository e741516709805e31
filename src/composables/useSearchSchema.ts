import { shallowRef } from 'vue';
import type { searchQuerySchema } from '@shared/schemas/search';

// The search form checks its fields with the API's own schema, but zod is not needed to show the
// results: the schema is fetched when a field first needs checking.
const schema = shallowRef<typeof searchQuerySchema | null>(null);
let loading: Promise<typeof searchQuerySchema> | null = null;

export function loadSearchSchema(): Promise<typeof searchQuerySchema> {
  loading ??= import('@shared/schemas/search').then((m) => (schema.value = m.searchQuerySchema));
  return loading;
}

/** The schema once loaded (reactive), null before; reading it starts the load. */
export function searchSchema(): typeof searchQuerySchema | null {
  if (!schema.value) void loadSearchSchema();
  return schema.value;
}
