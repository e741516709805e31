import { ref } from 'vue';
import type { KitItemPatch } from '@shared/schemas/planning';
import type { KitRecipeRef } from '@shared/api/planning';
import { useErrorToast } from '@/composables/useErrorToast';
import { useFormErrors } from '@/composables/useFormErrors';
import { useKitStore } from '@/stores/kit';

const PURPOSE: Record<KitRecipeRef['purpose'], string> = { 'fit-test': 'Fit test', 'set-ready': 'Set-ready' };

/** "Set-ready recipe · PETG · 0.2 mm layers · 40 % infill · 4 walls" */
export function recipeLine(r: Pick<KitRecipeRef, 'purpose' | 'material' | 'layerMm' | 'infillPct' | 'walls'>): string {
  return `${PURPOSE[r.purpose]} recipe · ${r.material} · ${r.layerMm} mm layers · ${r.infillPct} % infill · ${r.walls} walls`;
}

/** Changes to one kit item, checked with the shared schema first; messages land on the fields. */
export function useKitItemPatch(itemId: () => number) {
  const store = useKitStore();
  const showError = useErrorToast();
  const { errors, check, fromServer } = useFormErrors();
  const busy = ref(false);

  async function apply(patch: KitItemPatch, what: string): Promise<boolean> {
    // the schema (and zod) is fetched with the first change, not with the kit page
    const { kitItemPatchSchema } = await import('@shared/schemas/planning');
    const valid = check(kitItemPatchSchema, patch);
    if (!valid) return false;
    busy.value = true;
    try {
      await store.updateItem(itemId(), valid);
      return true;
    } catch (err) {
      if (!fromServer(err)) showError(err, what);
      return false;
    } finally {
      busy.value = false;
    }
  }

  return { errors, busy, apply };
}
