// The shoot kit open on the kit page: its fields and items, the summary the server works out from
// them, the printers an item can go on, and the shelf parts that can be added. Every change goes to
// the server and the summary is fetched again, so the figures always come from one place.
import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { KitDetail, KitItemInfo, KitSummaryResponse, PrinterInfo } from '@shared/api/planning';
import type { KitItemInput, KitItemPatch, KitPatch, KitSharesInput } from '@shared/schemas/planning';
import type { PartSummary } from '@shared/types';
import { DEFAULT_CURRENCY } from '@shared/money';
import { crewsApi, isApiError, partsApi, planningApi } from '@/api';
import { formatMoney } from '@/lib/format';

export const useKitStore = defineStore('kit', () => {
  const kit = ref<KitDetail | null>(null);
  const summary = ref<KitSummaryResponse | null>(null);
  /** The owner's printers (only the owner can list them). */
  const ownPrinters = ref<PrinterInfo[]>([]);
  /** Parts on the shelf now: what can be added, and the sizes of what is in the kit. */
  const shelf = ref<PartSummary[]>([]);
  const loading = ref(false);
  const missing = ref('');
  const summaryLoading = ref(false);
  const summaryFailed = ref(false);
  let summaryCall = 0;

  const access = computed(() => kit.value?.access ?? 'read');
  const isOwner = computed(() => access.value === 'owner');
  const canEdit = computed(() => access.value === 'owner' || access.value === 'edit');

  /**
   * Printers an item can be put on: the owner's own; a member with edit access cannot list the
   * owner's printers, so they choose among the ones the kit already uses.
   */
  const printerChoices = computed(() => {
    // the bed is known only for the viewer's own printers
    if (isOwner.value) return ownPrinters.value.map((p) => ({ id: p.id, name: p.name, bedMm: p.bedMm as PrinterInfo['bedMm'] | null }));
    const seen = new Map<number, { id: number; name: string; bedMm: PrinterInfo['bedMm'] | null }>();
    for (const item of kit.value?.items ?? []) if (item.printer) seen.set(item.printer.id, { ...item.printer, bedMm: null });
    return [...seen.values()];
  });

  function itemSummary(itemId: number): KitSummaryResponse['items'][number] | null {
    return summary.value?.items.find((i) => i.id === itemId) ?? null;
  }

  function shelfPart(partId: number): PartSummary | null {
    return shelf.value.find((p) => p.id === partId) ?? null;
  }

  async function refreshSummary() {
    if (!kit.value) return;
    const call = ++summaryCall;
    summaryLoading.value = true;
    try {
      const fresh = await planningApi.summary(kit.value.id);
      // an older answer must not replace a newer one
      if (call === summaryCall) {
        summary.value = fresh;
        summaryFailed.value = false;
      }
    } catch {
      if (call === summaryCall) summaryFailed.value = true;
    } finally {
      if (call === summaryCall) summaryLoading.value = false;
    }
  }

  async function open(id: number) {
    loading.value = true;
    missing.value = '';
    kit.value = null;
    summary.value = null;
    ownPrinters.value = [];
    try {
      kit.value = await planningApi.kit(id);
      await Promise.all([
        refreshSummary(),
        isOwner.value
          ? planningApi
              .printers()
              .then((p) => (ownPrinters.value = p))
              .catch(() => undefined)
          : undefined,
        partsApi
          .published()
          .then((p) => (shelf.value = p))
          .catch(() => undefined),
      ]);
    } catch (err) {
      kit.value = null;
      missing.value = isApiError(err) ? err.message : 'The kit could not be loaded. Reload the page and try again.';
    } finally {
      loading.value = false;
    }
  }

  async function save(patch: KitPatch) {
    kit.value = await planningApi.updateKit(kit.value!.id, patch);
    await refreshSummary();
  }

  function replaceItem(item: KitItemInfo) {
    const items = kit.value!.items;
    const at = items.findIndex((i) => i.id === item.id);
    if (at >= 0) items.splice(at, 1, item);
    else items.push(item);
  }

  async function addItem(input: KitItemInput): Promise<KitItemInfo> {
    const item = await planningApi.addItem(kit.value!.id, input);
    replaceItem(item);
    await refreshSummary();
    return item;
  }

  async function updateItem(itemId: number, patch: KitItemPatch): Promise<KitItemInfo> {
    const item = await planningApi.updateItem(kit.value!.id, itemId, patch);
    replaceItem(item);
    await refreshSummary();
    return item;
  }

  async function removeItem(itemId: number) {
    await planningApi.removeItem(kit.value!.id, itemId);
    kit.value!.items = kit.value!.items.filter((i) => i.id !== itemId);
    await refreshSummary();
  }

  async function setShares(input: KitSharesInput) {
    const { shares } = await planningApi.setShares(kit.value!.id, input);
    kit.value!.shares = shares;
  }

  async function setCrewShares(crewShares: { crewId: number; access: 'read' | 'edit' }[]) {
    const saved = await crewsApi.setKitCrewShares(kit.value!.id, crewShares);
    kit.value!.crewShares = saved.crewShares;
  }

  async function remove() {
    await planningApi.deleteKit(kit.value!.id);
    kit.value = null;
    summary.value = null;
  }

  /** The kit owner's currency: every cost on the kit page is in it. */
  const currency = computed(() => summary.value?.currency ?? DEFAULT_CURRENCY);
  const money = (amount: number) => formatMoney(amount, currency.value);

  return {
    currency,
    money,
    kit,
    summary,
    ownPrinters,
    shelf,
    loading,
    missing,
    summaryLoading,
    summaryFailed,
    access,
    isOwner,
    canEdit,
    printerChoices,
    itemSummary,
    shelfPart,
    open,
    refreshSummary,
    save,
    addItem,
    updateItem,
    removeItem,
    setShares,
    setCrewShares,
    remove,
  };
});
