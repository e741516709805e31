// The part being put on the shelf (or changed) in the submit flow: every field of every step, the
// chosen files with their measurements, and the inline messages. Kept in a store so a contributor who
// leaves the flow to look something up comes back to what they typed.
import { UPLOAD_LIMITS } from '@shared/uploads';
import { defineStore } from 'pinia';
import { computed, markRaw, reactive, ref, toRaw } from 'vue';
import type { z } from 'zod';
import type { PartDetail } from '@shared/api/parts';
import type { CategorySlug, MountSlug, SafetyFlags } from '@shared/catalogue';
import { checkAdaptationLicence, isLicenceId, type LicenceId } from '@shared/licences';
import { MeshError, type ModelFileAnalysis } from '@shared/mesh/types';
import { partSubmissionSchema, partUpdateSchema, type PartSubmission, type PartUpdate } from '@shared/schemas/part';
import type { RecipeInput } from '@shared/schemas/recipe';
import type { FileKind, PartFileInfo } from '@shared/types';
import { parseLength } from '@shared/units';
import { fieldErrors } from '@shared/validation';
import { formatBytes } from '@/format';

export const STEPS = [
  { key: 'details', label: 'What it is', short: 'About' },
  { key: 'files', label: 'Files and photos', short: 'Files' },
  { key: 'fit', label: 'What it fits', short: 'Fit' },
  { key: 'recipes', label: 'Print recipes', short: 'Recipes' },
  { key: 'licence', label: 'Licence and safety', short: 'Licence' },
  { key: 'review', label: 'Check and send', short: 'Send' },
] as const;
export type StepKey = (typeof STEPS)[number]['key'];

/** Which step shows a field, by the first segment of its key ("recipes.0.layerMm" → recipes). */
const STEP_FIELDS: Record<StepKey, readonly string[]> = {
  details: ['title', 'summary', 'description', 'category'],
  files: ['model', 'photo', 'source', 'drawnInInches'],
  fit: ['bodies', 'mounts', 'keyDimensions'],
  recipes: ['recipes'],
  licence: ['licence', 'safety', 'testedLoadKg', 'parentId', 'visibility'],
  review: [],
};

export function stepOfField(key: string): StepKey {
  const head = key.split('.')[0];
  return STEPS.find((s) => STEP_FIELDS[s.key].includes(head))?.key ?? 'review';
}

// The server's upload limits (server/modules/files/upload.ts), checked here first so nobody waits
// for a 150 MB upload to be refused.
export { UPLOAD_LIMITS };
const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'];

export interface DraftFile {
  uid: string;
  kind: FileKind;
  file: File;
  /** Photos: an object URL for the thumbnail. */
  previewUrl: string | null;
  analysing: boolean;
  analysis: ModelFileAnalysis | null;
  /** Why the file cannot be sent (wrong type, too big, not a mesh). */
  error: string | null;
}

export interface ExistingFile {
  info: PartFileInfo;
  remove: boolean;
}

export interface KeyDimensionRow {
  uid: string;
  name: string;
  /** As typed: "15", "15 mm", "5/8 in". */
  value: string;
  tol: string;
}

export interface RecipeForm {
  uid: string;
  purpose: RecipeInput['purpose'];
  material: RecipeInput['material'];
  nozzleMm: number | null;
  layerMm: number | null;
  walls: number | null;
  topBottomLayers: number | null;
  infillPct: number | null;
  infillPattern: RecipeInput['infillPattern'];
  hotendC: number | null;
  bedC: number | null;
  speedMmS: number | null;
  supports: RecipeInput['supports'];
  orientationNote: string;
  printerBedMm: [number | null, number | null, number | null];
  resultNotes: string;
}

let uidCounter = 0;
const uid = () => `d${++uidCounter}`;

export function blankRecipe(purpose: RecipeInput['purpose'] = 'set-ready'): RecipeForm {
  return {
    uid: uid(),
    purpose,
    material: 'PLA',
    nozzleMm: 0.4,
    layerMm: 0.2,
    walls: 3,
    topBottomLayers: 4,
    infillPct: null,
    infillPattern: 'gyroid',
    hotendC: null,
    bedC: null,
    speedMmS: null,
    supports: 'none',
    orientationNote: '',
    printerBedMm: [null, null, null],
    resultNotes: '',
  };
}

function recipeFormOf(r: RecipeInput): RecipeForm {
  return {
    ...blankRecipe(r.purpose),
    ...r,
    orientationNote: r.orientationNote ?? '',
    resultNotes: r.resultNotes ?? '',
    printerBedMm: r.printerBedMm ? [...r.printerBedMm] : [null, null, null],
  };
}

function blankSafety(): SafetyFlags {
  return { carriesLoad: false, overhead: false, vehicle: false, heat: false };
}

/** A typed length in mm; NaN when it is not one (so the schema reports it), undefined when empty. */
function lengthOf(text: string): number | undefined {
  if (!text.trim()) return undefined;
  return parseLength(text) ?? Number.NaN;
}

const LENGTH_HINT = 'Write a length such as 15, 15 mm or 5/8 in.';

export type DraftMode = 'new' | 'adapt' | 'edit';

/** What a draft keeps between visits (src/draftStorage.ts): the typed fields and the chosen files. */
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

  const files = ref<DraftFile[]>([]);
  const existing = ref<ExistingFile[]>([]);
  const drawnInInches = ref(false);

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

  function clearFiles() {
    for (const f of files.value) if (f.previewUrl) URL.revokeObjectURL(f.previewUrl);
    files.value = [];
    existing.value = [];
  }

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
    recipes.value = part.recipes.length
      ? part.recipes.map(({ id: _id, warnings: _w, ...r }) => recipeFormOf(r))
      : [blankRecipe()];
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
  function startMade(input: { kind: string; params: Record<string, unknown>; label: string; title: string; summary: string; file: File; loadBearing: boolean; recipe: Partial<Pick<RecipeForm, 'material' | 'nozzleMm' | 'layerMm' | 'walls' | 'topBottomLayers' | 'infillPct' | 'speedMmS'>> }) {
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

  // ---- files -------------------------------------------------------------------------------

  const modelFiles = computed(() => files.value.filter((f) => f.kind === 'model'));
  const photoFiles = computed(() => files.value.filter((f) => f.kind === 'photo'));
  const sourceFiles = computed(() => files.value.filter((f) => f.kind === 'source'));

  async function measure(entry: DraftFile) {
    entry.analysing = true;
    entry.error = null;
    try {
      const { analyseModel } = await import('@/meshAnalysis');
      entry.analysis = markRaw(await analyseModel(entry.file, { drawnInInches: drawnInInches.value }));
    } catch (err) {
      entry.analysis = null;
      entry.error = err instanceof MeshError ? err.message : 'This file could not be read. Export it again as STL or 3MF.';
    } finally {
      entry.analysing = false;
    }
  }

  function tooBig(kind: FileKind, file: File): string | null {
    const limit = UPLOAD_LIMITS[kind];
    if (file.size === 0) return 'The file is empty (0 bytes). Export it again.';
    if (file.size > limit) return `${kind === 'photo' ? 'Photos' : 'Files'} may be at most ${formatBytes(limit)}; this one is ${formatBytes(file.size)}.`;
    return null;
  }

  function addFiles(kind: FileKind, list: FileList | File[]) {
    for (const file of Array.from(list)) {
      let error = tooBig(kind, file);
      if (!error && kind === 'photo' && !PHOTO_TYPES.includes(file.type)) error = 'Photos must be JPEG, PNG or WebP images.';
      if (!error && kind === 'model' && !/\.(stl|3mf)$/i.test(file.name)) error = 'Model files must be STL or 3MF. Put CAD files (STEP and the like) under source files.';
      const entry = reactive<DraftFile>({
        uid: uid(),
        kind,
        file: markRaw(file),
        previewUrl: kind === 'photo' && !error ? URL.createObjectURL(file) : null,
        analysing: false,
        analysis: null,
        error,
      });
      files.value.push(entry);
      if (kind === 'model' && !error) void measure(entry);
    }
    delete errors.value[kind];
  }

  function removeFile(entryUid: string) {
    const entry = files.value.find((f) => f.uid === entryUid);
    if (entry?.previewUrl) URL.revokeObjectURL(entry.previewUrl);
    files.value = files.value.filter((f) => f.uid !== entryUid);
  }

  /** Puts a photo first: the first photo is the one the shelf shows on cards. */
  function makeCover(entryUid: string) {
    const i = files.value.findIndex((f) => f.uid === entryUid);
    if (i < 0) return;
    const [entry] = files.value.splice(i, 1);
    files.value.unshift(entry);
  }

  function setDrawnInInches(on: boolean) {
    drawnInInches.value = on;
    for (const f of modelFiles.value) if (!f.error || f.analysis) void measure(f);
  }

  /** Editing: the files just uploaded are now on the part; later retries must not send them again. */
  function filesSaved(part: PartDetail) {
    for (const f of files.value) if (f.previewUrl) URL.revokeObjectURL(f.previewUrl);
    files.value = [];
    const removing = new Set(existing.value.filter((e) => e.remove).map((e) => e.info.id));
    existing.value = part.files.map((info) => ({ info, remove: removing.has(info.id) }));
  }

  function fileRemoved(fileId: number) {
    existing.value = existing.value.filter((e) => e.info.id !== fileId);
  }

  const keptModels = computed(() => existing.value.filter((e) => e.info.kind === 'model' && !e.remove));

  // ---- the payload ---------------------------------------------------------------------------

  function recipeInput(r: RecipeForm) {
    const bed = r.printerBedMm.some((v) => v !== null) ? r.printerBedMm : undefined;
    return {
      purpose: r.purpose,
      material: r.material,
      nozzleMm: r.nozzleMm,
      layerMm: r.layerMm,
      walls: r.walls,
      topBottomLayers: r.topBottomLayers,
      infillPct: r.infillPct,
      infillPattern: r.infillPattern,
      hotendC: r.hotendC,
      bedC: r.bedC,
      speedMmS: r.speedMmS,
      supports: r.supports,
      orientationNote: r.orientationNote.trim() || undefined,
      printerBedMm: bed,
      resultNotes: r.resultNotes.trim() || undefined,
    };
  }

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

  const PICKS = {
    details: { title: true, summary: true, description: true, category: true },
    fit: { bodies: true, mounts: true, keyDimensions: true },
    recipes: { recipes: true },
    licence: { licence: true, safety: true, testedLoadKg: true },
  } as const;

  function schemaIssues<S extends z.ZodType>(schema: S, value: unknown): Record<string, string> {
    const result = schema.safeParse(value);
    return result.success ? {} : fieldErrors(result.error);
  }

  function fileIssues(): Record<string, string> {
    const out: Record<string, string> = {};
    const models = modelFiles.value;
    if (models.some((f) => f.analysing)) out.model = 'Wait until every model file is measured.';
    else if (files.value.some((f) => f.error)) {
      const bad = files.value.find((f) => f.error)!;
      out[bad.kind] = `${bad.file.name} cannot be sent (see above): remove it or replace it.`;
    } else if (!models.length && !keptModels.value.length) out.model = 'Add at least one model file (STL or 3MF).';
    if (files.value.length > UPLOAD_LIMITS.filesPerRequest) {
      out.source ??= `Send at most ${UPLOAD_LIMITS.filesPerRequest} files at once; add the rest after it is on the shelf.`;
    }
    return out;
  }

  function licenceIssues(): Record<string, string> {
    const from = parent.value;
    if (!from || !licence.value || !isLicenceId(from.licence.id)) return {};
    const check = checkAdaptationLicence(from.licence.id, licence.value);
    return check.ok ? {} : { licence: check.reason };
  }

  function safetyIssues(): Record<string, string> {
    if (mode.value !== 'adapt' || safetyStated.value) return {};
    return { safety: 'Say where your adaptation is used: tick what applies (or nothing) and confirm it below. Nothing is copied from the original.' };
  }

  function dimensionIssues(): Record<string, string> {
    const out: Record<string, string> = {};
    keyDimensions.value.forEach((d, i) => {
      if (d.value.trim() && parseLength(d.value) === null) out[`keyDimensions.${i}.valueMm`] = LENGTH_HINT;
      if (d.tol.trim() && parseLength(d.tol) === null) out[`keyDimensions.${i}.tolMm`] = LENGTH_HINT;
    });
    return out;
  }

  function issuesOf(step: StepKey): Record<string, string> {
    const data = fields();
    switch (step) {
      case 'details':
        return schemaIssues(partSubmissionSchema.pick(PICKS.details), data);
      case 'files':
        return fileIssues();
      case 'fit':
        return { ...schemaIssues(partSubmissionSchema.pick(PICKS.fit), data), ...dimensionIssues() };
      case 'recipes':
        return schemaIssues(partSubmissionSchema.pick(PICKS.recipes), data);
      case 'licence':
        return { ...schemaIssues(partSubmissionSchema.pick(PICKS.licence), data), ...licenceIssues(), ...safetyIssues() };
      case 'review': {
        const whole = mode.value === 'edit' ? schemaIssues(partUpdateSchema, data) : schemaIssues(partSubmissionSchema, submission());
        const all: Record<string, string> = { ...whole };
        for (const s of STEPS) if (s.key !== 'review') Object.assign(all, issuesOf(s.key));
        return all;
      }
    }
  }

  /** Replaces the messages of one step; true when it has none. */
  function checkStep(step: StepKey): boolean {
    const found = issuesOf(step);
    const kept = Object.fromEntries(Object.entries(errors.value).filter(([k]) => step !== 'review' && stepOfField(k) !== step));
    errors.value = { ...kept, ...found };
    if (!checked.value.includes(step)) checked.value.push(step);
    return Object.keys(found).length === 0;
  }

  /** Re-checks the steps already tried, so a message goes away as soon as it is fixed. */
  function recheck() {
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
    return partSubmissionSchema.parse(submission());
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
      s.fields.title.trim() || s.fields.summary.trim() || s.fields.description.trim() || s.fields.category ||
      s.files.length || s.fields.bodies.length || s.fields.mounts.length || s.fields.keyDimensions.length ||
      s.fields.recipes.length !== 1 || JSON.stringify({ ...s.fields.recipes[0], uid: '' }) !== blank ||
      (mode.value === 'new' && s.fields.licence) || Object.values(s.fields.safety).some(Boolean) || s.fields.safetyStated
    );
  });

  /** Editing: whether the fields or the files differ from what was loaded. */
  const changed = computed(
    () => files.value.length > 0 || existing.value.some((e) => e.remove) || JSON.stringify(fields()) !== baseline.value,
  );

  function validUpdate(): PartUpdate | null {
    if (!checkStep('review')) return null;
    return partUpdateSchema.parse(fields());
  }

  return {
    key, mode, parent, editing, made, startMade,
    title, summary, description, category,
    files, existing, drawnInInches, modelFiles, photoFiles, sourceFiles, keptModels,
    bodies, mounts, keyDimensions,
    recipes,
    licence, safety, testedLoadKg, crewId, safetyStated,
    errors, checked, changed, hasContent,
    snapshot, restore,
    reset, startAdapt, startEdit, setParent,
    addFiles, removeFile, makeCover, setDrawnInInches, filesSaved, fileRemoved,
    submission, checkStep, recheck, stepHasErrors, takeServerErrors, validSubmission, validUpdate,
    newKeyDimension: (): KeyDimensionRow => ({ uid: uid(), name: '', value: '', tol: '' }),
  };
});
