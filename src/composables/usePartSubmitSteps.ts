// The submit flow's steps as the address has them (?step=files): which one is on screen, its
// neighbours, which are done or carry messages, and the line shown under each in the checklist.
import { computed } from 'vue';
import { useRoute, useRouter } from 'vue-router';
import { plural } from '@/lib/format';
import { STEPS, usePartDraftStore, type StepKey } from '@/stores/partDraft';
import { useVocabStore } from '@/stores/vocab';

/** `prepare`: fetches a step's form before the flow moves to it (so the step never shows empty). */
export function usePartSubmitSteps(prepare: (step: StepKey) => Promise<unknown> = async () => undefined) {
  const route = useRoute();
  const router = useRouter();
  const draft = usePartDraftStore();
  const vocab = useVocabStore();

  const current = computed<StepKey>(() => {
    const step = route.query.step;
    return STEPS.find((s) => s.key === step)?.key ?? 'details';
  });
  const index = computed(() => STEPS.findIndex((s) => s.key === current.value));
  const currentStep = computed(() => STEPS[index.value]);
  const nextStep = computed(() => STEPS[index.value + 1] ?? null);
  const prevStep = computed(() => STEPS[index.value - 1] ?? null);

  const withErrors = computed(() => STEPS.filter((s) => draft.stepHasErrors(s.key)).map((s) => s.key));
  const done = computed(() => draft.checked.filter((s) => !withErrors.value.includes(s)));

  const notes = computed<Partial<Record<StepKey, string>>>(() => ({
    details: draft.title.trim() ? draft.title.trim() : undefined,
    files:
      draft.files.length || draft.existing.length
        ? `${plural(draft.modelFiles.filter((f) => !f.error).length + draft.keptModels.length, 'model')}, ${plural(draft.photoFiles.filter((f) => !f.error).length + draft.existing.filter((e) => e.info.kind === 'photo' && !e.remove).length, 'photo')}`
        : undefined,
    fit: draft.bodies.length || draft.mounts.length ? `${plural(draft.bodies.length, 'body', 'bodies')}, ${plural(draft.mounts.length, 'mount')}` : undefined,
    recipes: plural(draft.recipes.length, 'recipe'),
    licence: vocab.vocab?.licences.find((l) => l.id === draft.licence)?.shortName,
  }));

  async function go(step: StepKey) {
    if (step === current.value) return;
    await prepare(step).catch(() => undefined);
    await router.push({ query: { ...route.query, step } });
  }

  return { current, currentStep, nextStep, prevStep, withErrors, done, notes, go };
}
