// The part being put on the shelf (or changed) in the submit flow: every field of every step, the
// chosen files with their measurements, and the inline messages. Kept in a store so a contributor who
// leaves the flow to look something up comes back to what they typed. The field shapes are in
// partDraftFields.ts, the files in composables/usePartDraftFiles.ts, the step checks in partDraftSteps.ts.
import { UPLOAD_LIMITS } from '@shared/uploads';
import { defineStore } from 'pinia';
import { computed, reactive, ref, toRaw } from 'vue';
import type { PartDetail } from '@shared/api/parts';
import type { CategorySlug, MountSlug, SafetyFlags } from '@shared/catalogue';
import { isLicenceId, type LicenceId } from '@shared/licences';
import type { PartSubmission, PartUpdate } from '@shared/schemas/part';
import type { FileKind } from '@shared/types';
import { usePartDraftFiles } from '@/composables/usePartDraftFiles';
import { blankRecipe, blankSafety, lengthOf, recipeFormOf, recipeInput, uid, type KeyDimensionRow, type RecipeForm } from './partDraftFields';
import { issuesOf, partSchemas, partSchemasLoaded, STEPS, stepOfField, type StepKey } from './partDraftSteps';

export { loadPartSchemas, STEPS, stepOfField, type StepKey } from './partDraftSteps';
export { blankRecipe, type KeyDimensionRow, type RecipeForm } from './partDraftFields';
export type { DraftFile, ExistingFile } from '@/composables/usePartDraftFiles';
// The server's upload limits (server/modules/files/upload.ts), checked here first.
export { UPLOAD_LIMITS };

export type DraftMode = 'new' | 'adapt' | 'edit';

/** What a draft keeps between visits (src/lib/draftStorage.ts): the typed fields and the chosen files. */
export interface PartDraftSnapshot {
  fields: {
    title: string;
    summary: string;
    description: string;
    category: CategorySlug | null;
    drawnInInches: boolean;
    bodies: string[];
    mounts: { slug: MountSlug; note: string }[];
    keyDimensions: KeyDimensionRow[];
    recipes: RecipeForm[];
    licence: LicenceId | null;
    safety: SafetyFlags;
    /** Older drafts lack these two. */
    crewId?: number | null;
    made?: { kind: string; params: Record<string, unknown>; label: string } | null;
    testedLoadKg: number | null;
    safetyStated: boolean;
  };
  files: { kind: FileKind; file: File }[];
  /** Editing: files on the part the contributor marked for removal. */
  removing: number[];
}

export const usePartDraftStore = defineStore('partDraft', () => {
  /** "new", "adapt:12" or "edit:12": the flow the fields belong to. */
  const key = ref('');
  const mode = ref<DraftMode>('new');
  /** Set when the part comes from a make page: the maker, its sizes and how to say it. */
  const made = ref<{ kind: string; params: Record<string, unknown>; label: string } | null>(null);
  /** Adapting: the part this one is adapted from. Editing: the part as it was loaded. */
  const parent = ref<PartDetail | null>(null);
  const editing = ref<PartDetail | null>(null);

  const title = ref('');
  const summary = ref('');
  const description = ref('');
  const category = ref<CategorySlug | null>(null);

  const bodies = ref<string[]>([]);
  const mounts = ref<{ slug: MountSlug; note: string }[]>([]);
  const keyDimensions = ref<KeyDimensionRow[]>([]);

  const recipes = ref<RecipeForm[]>([blankRecipe()]);

  const licence = ref<LicenceId | null>(null);
  const safety = reactive<SafetyFlags>(blankSafety());
  const testedLoadKg = ref<number | null>(null);
  /** Published to this crew only, or null for everyone on the shelf. */
  const crewId = ref<number | null>(null);
  /** Adapting: the contributor has said where their own part is used (nothing comes from the original). */
  const safetyStated = ref(false);

  /** Editing: the fields as loaded, to tell whether anything changed. */
  const baseline = ref('');
  const errors = ref<Record<string, string>>({});
  /** Steps the contributor has tried to leave: their messages update as they type. */
  const checked = ref<StepKey[]>([]);

  const draftFiles = usePartDraftFiles(errors);
  const { files, existing, drawnInInches, modelFiles, photoFiles, sourceFiles, keptModels } = draftFiles;
  const { clearFiles, addFiles, removeFile, makeCover, setDrawnInInches, filesSaved, fileRemoved } = draftFiles;

  function reset(newKey = '') {
    clearFiles();
    key.value = newKey;
    mode.value = 'new';
    made.value = null;
    parent.value = null;
    editing.value = null;
    title.value = '';
    summary.value = '';
    description.value = '';
    category.value = null;
    drawnInInches.value = false;
    bodies.value = [];
    mounts.value = [];
    keyDimensions.value = [];
    recipes.value = [blankRecipe()];
    licence.value = null;
    Object.assign(safety, blankSafety());
    testedLoadKg.value = null;
    crewId.value = null;
    safetyStated.value = false;
    baseline.value = '';
    errors.value = {};
    checked.value = [];
  }

  /** Fills every field except the files from a part on the shelf; the safety claims only when asked. */
  function fillFrom(part: PartDetail, { safetyClaims }: { safetyClaims: boolean }) {
    title.value = part.title;
    summary.value = part.summary;
    description.value = part.description;
    category.value = part.category.slug as CategorySlug;
    bodies.value = part.compatibility.bodies.map((b) => b.slug);
    mounts.value = part.compatibility.mounts.map((m) => ({ slug: m.slug, note: m.note ?? '' }));
    keyDimensions.value = part.compatibility.keyDimensions.map((d) => ({
      uid: uid(),
      name: d.name,
      value: String(d.valueMm),
      tol: d.tolMm ? String(d.tolMm) : '',
    }));
    recipes.value = part.recipes.length ? part.recipes.map(({ id: _id, warnings: _w, ...r }) => recipeFormOf(r)) : [blankRecipe()];
    if (!safetyClaims) return;
    Object.assign(safety, {
      carriesLoad: part.safety.carriesLoad,
      overhead: part.safety.overhead,
      vehicle: part.safety.vehicle,
      heat: part.safety.heat,
    });
    testedLoadKg.value = part.safety.testedLoadKg;
  }

  /**
   * A part made on a make page, going to the shelf: the made file, a title and summary to start from,
   * the made-part print settings, and the load flag when the part can carry load. It carries no tested load.
   */
  function startMade(input: {
    kind: string;
    params: Record<string, unknown>;
    label: string;
    title: string;
    summary: string;
    file: File;
    loadBearing: boolean;
    recipe: Partial<Pick<RecipeForm, 'material' | 'nozzleMm' | 'layerMm' | 'walls' | 'topBottomLayers' | 'infillPct' | 'speedMmS'>>;
  }) {
    reset('new');
    made.value = { kind: input.kind, params: input.params, label: input.label };
    title.value = input.title.slice(0, 120);
    summary.value = input.summary.slice(0, 280);
    recipes.value = [{ ...blankRecipe(), ...input.recipe }];
    safety.carriesLoad = input.loadBearing;
    addFiles('model', [input.file]);
  }

  function startAdapt(from: PartDetail) {
    reset(`adapt:${from.id}`);
    mode.value = 'adapt';
    parent.value = from;
    // what the original carries, and what load it was tested with, says nothing about the changed
    // part: its contributor states both for their own print
    fillFrom(from, { safetyClaims: false });
    const rule = from.licence.adaptation;
    // keep the parent's licence when an adaptation may carry it, otherwise leave the choice open
    licence.value = isLicenceId(from.licence.id) && rule?.allowedChildIds.includes(from.licence.id) ? from.licence.id : null;
  }

  function startEdit(part: PartDetail) {
    reset(`edit:${part.id}`);
    mode.value = 'edit';
    editing.value = part;
    fillFrom(part, { safetyClaims: true });
    licence.value = isLicenceId(part.licence.id) ? part.licence.id : null;
    crewId.value = part.visibility === 'everyone' ? null : part.visibility.crewId;
    existing.value = part.files.map((info) => ({ info, remove: false }));
    baseline.value = JSON.stringify(fields());
  }

  /** Editing an adaptation: the parent whose licence limits this one's (the server checks it too). */
  function setParent(from: PartDetail | null) {
    parent.value = from;
  }

  // ---- the payload ---------------------------------------------------------------------------

  /** Everything but the files, as the schemas expect it (not yet validated). */
  function fields() {
    return {
      title: title.value,
      summary: summary.value,
      description: description.value,
      category: category.value ?? undefined,
      bodies: bodies.value,
      mounts: mounts.value.map((m) => (m.note.trim() ? { slug: m.slug, note: m.note.trim() } : { slug: m.slug })),
      keyDimensions: keyDimensions.value.map((d) => ({ name: d.name, valueMm: lengthOf(d.value), tolMm: lengthOf(d.tol) ?? 0 })),
      safety: { ...safety },
      // a made part's sizes were never load-tested
      testedLoadKg: safety.carriesLoad && !made.value ? testedLoadKg.value : null,
      licence: licence.value ?? undefined,
      recipes: recipes.value.map(recipeInput),
      visibility: crewId.value === null ? ('everyone' as const) : { crewId: crewId.value },
    };
  }

  function submission() {
    return {
      ...fields(),
      parentId: mode.value === 'adapt' ? (parent.value?.id ?? null) : null,
      drawnInInches: drawnInInches.value,
      ...(made.value ? { make: { kind: made.value.kind, params: made.value.params } } : {}),
    };
  }

  // ---- checking ------------------------------------------------------------------------------

  function issuesOfStep(step: StepKey): Record<string, string> {
    return issuesOf(step, {
      mode: mode.value,
      fields: fields(),
      submission: submission(),
      keyDimensions: keyDimensions.value,
      licence: licence.value,
      parentLicenceId: parent.value?.licence.id ?? null,
      safetyStated: safetyStated.value,
      fileIssues: draftFiles.fileIssues,
    });
  }

  /** Replaces the messages of one step; true when it has none. */
  function checkStep(step: StepKey): boolean {
    const found = issuesOfStep(step);
    const kept = Object.fromEntries(Object.entries(errors.value).filter(([k]) => step !== 'review' && stepOfField(k) !== step));
    errors.value = { ...kept, ...found };
    if (!checked.value.includes(step)) checked.value.push(step);
    return Object.keys(found).length === 0;
  }

  /** Re-checks the steps already tried, so a message goes away as soon as it is fixed. */
  function recheck() {
    // nothing was checked before the schemas came
    if (!partSchemasLoaded()) return;
    for (const step of checked.value) if (step !== 'review') checkStep(step);
  }

  function stepHasErrors(step: StepKey): boolean {
    return Object.keys(errors.value).some((k) => stepOfField(k) === step);
  }

  /** The server's 422 messages; returns the first step that has one. */
  function takeServerErrors(fieldsFromServer: Record<string, string>): StepKey {
    errors.value = { ...fieldsFromServer };
    const steps = Object.keys(fieldsFromServer).map(stepOfField);
    for (const s of steps) if (!checked.value.includes(s)) checked.value.push(s);
    return STEPS.find((s) => steps.includes(s.key))?.key ?? 'review';
  }

  /** Validated payloads, or null if a check failed (messages are then in `errors`). */
  function validSubmission(): PartSubmission | null {
    if (!checkStep('review')) return null;
    return partSchemas().partSubmissionSchema.parse(submission());
  }

  function snapshot(): PartDraftSnapshot {
    const fields = JSON.parse(
      JSON.stringify({
        title: title.value,
        summary: summary.value,
        description: description.value,
        category: category.value,
        drawnInInches: drawnInInches.value,
        bodies: bodies.value,
        mounts: mounts.value,
        keyDimensions: keyDimensions.value,
        recipes: recipes.value,
        licence: licence.value,
        safety,
        testedLoadKg: testedLoadKg.value,
        safetyStated: safetyStated.value,
        crewId: crewId.value,
        made: made.value,
      }),
    ) as PartDraftSnapshot['fields'];
    return {
      fields,
      files: files.value.filter((f) => !f.error).map((f) => ({ kind: f.kind, file: toRaw(f.file) })),
      removing: existing.value.filter((e) => e.remove).map((e) => e.info.id),
    };
  }

  /** Puts a kept draft back on top of the flow already started (reset, adapt or edit). */
  function restore(saved: PartDraftSnapshot) {
    const f = saved.fields;
    title.value = f.title;
    summary.value = f.summary;
    description.value = f.description;
    category.value = f.category;
    drawnInInches.value = f.drawnInInches;
    bodies.value = [...f.bodies];
    mounts.value = f.mounts.map((m) => ({ ...m }));
    keyDimensions.value = f.keyDimensions.map((d) => ({ ...d, uid: uid() }));
    recipes.value = f.recipes.length ? f.recipes.map((r) => ({ ...blankRecipe(r.purpose), ...r, uid: uid() })) : [blankRecipe()];
    licence.value = f.licence;
    Object.assign(safety, f.safety);
    testedLoadKg.value = f.testedLoadKg;
    safetyStated.value = f.safetyStated;
    crewId.value = f.crewId ?? null;
    made.value = f.made ?? null;
    for (const e of existing.value) e.remove = saved.removing.includes(e.info.id);
    for (const kind of ['model', 'photo', 'source'] as const) {
      const chosen = saved.files.filter((x) => x.kind === kind).map((x) => x.file);
      if (chosen.length) addFiles(kind, chosen);
    }
  }

  /** Anything typed or chosen that a reload would otherwise lose. */
  const hasContent = computed(() => {
    if (mode.value === 'edit') return changed.value;
    const s = snapshot();
    const blank = JSON.stringify({ ...blankRecipe(), uid: '' });
    return !!(
      s.fields.title.trim() ||
      s.fields.summary.trim() ||
      s.fields.description.trim() ||
      s.fields.category ||
      s.files.length ||
      s.fields.bodies.length ||
      s.fields.mounts.length ||
      s.fields.keyDimensions.length ||
      s.fields.recipes.length !== 1 ||
      JSON.stringify({ ...s.fields.recipes[0], uid: '' }) !== blank ||
      (mode.value === 'new' && s.fields.licence) ||
      Object.values(s.fields.safety).some(Boolean) ||
      s.fields.safetyStated
    );
  });

  /** Editing: whether the fields or the files differ from what was loaded. */
  const changed = computed(() => files.value.length > 0 || existing.value.some((e) => e.remove) || JSON.stringify(fields()) !== baseline.value);

  function validUpdate(): PartUpdate | null {
    if (!checkStep('review')) return null;
    return partSchemas().partUpdateSchema.parse(fields());
  }

  return {
    key,
    mode,
    parent,
    editing,
    made,
    startMade,
    title,
    summary,
    description,
    category,
    files,
    existing,
    drawnInInches,
    modelFiles,
    photoFiles,
    sourceFiles,
    keptModels,
    bodies,
    mounts,
    keyDimensions,
    recipes,
    licence,
    safety,
    testedLoadKg,
    crewId,
    safetyStated,
    errors,
    checked,
    changed,
    hasContent,
    snapshot,
    restore,
    reset,
    startAdapt,
    startEdit,
    setParent,
    addFiles,
    removeFile,
    makeCover,
    setDrawnInInches,
    filesSaved,
    fileRemoved,
    submission,
    checkStep,
    recheck,
    stepHasErrors,
    takeServerErrors,
    validSubmission,
    validUpdate,
    newKeyDimension: (): KeyDimensionRow => ({ uid: uid(), name: '', value: '', tol: '' }),
  };
});
