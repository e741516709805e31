// The submit form's chosen files: checked against the server's upload limits first (so nobody waits
// for a 150 MB upload to be refused), models measured in a worker, photo thumbnails as object URLs
// (revoked when a file leaves), and, when editing, the files already on the part.
import { computed, markRaw, reactive, ref, type Ref } from 'vue';
import type { PartDetail } from '@shared/api/parts';
import { MeshError, type ModelFileAnalysis } from '@shared/mesh/types';
import type { FileKind, PartFileInfo } from '@shared/types';
import { UPLOAD_LIMITS } from '@shared/uploads';
import { formatBytes } from '@/lib/format';
import { uid } from '@/stores/partDraftFields';

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

function tooBig(kind: FileKind, file: File): string | null {
  const limit = UPLOAD_LIMITS[kind];
  if (file.size === 0) return 'The file is empty (0 bytes). Export it again.';
  if (file.size > limit) return `${kind === 'photo' ? 'Photos' : 'Files'} may be at most ${formatBytes(limit)}; this one is ${formatBytes(file.size)}.`;
  return null;
}

/** `errors` is the draft's message map: choosing files of a kind clears that kind's message. */
export function usePartDraftFiles(errors: Ref<Record<string, string>>) {
  const files = ref<DraftFile[]>([]);
  const existing = ref<ExistingFile[]>([]);
  const drawnInInches = ref(false);

  const modelFiles = computed(() => files.value.filter((f) => f.kind === 'model'));
  const photoFiles = computed(() => files.value.filter((f) => f.kind === 'photo'));
  const sourceFiles = computed(() => files.value.filter((f) => f.kind === 'source'));
  const keptModels = computed(() => existing.value.filter((e) => e.info.kind === 'model' && !e.remove));

  async function measure(entry: DraftFile) {
    entry.analysing = true;
    entry.error = null;
    try {
      const { analyseModel } = await import('@/lib/meshAnalysis');
      entry.analysis = markRaw(await analyseModel(entry.file, { drawnInInches: drawnInInches.value }));
    } catch (err) {
      entry.analysis = null;
      entry.error = err instanceof MeshError ? err.message : 'This file could not be read. Export it again as STL or 3MF.';
    } finally {
      entry.analysing = false;
    }
  }

  function clearFiles() {
    for (const f of files.value) if (f.previewUrl) URL.revokeObjectURL(f.previewUrl);
    files.value = [];
    existing.value = [];
  }

  function addFiles(kind: FileKind, list: FileList | File[]) {
    for (const file of Array.from(list)) {
      let error = tooBig(kind, file);
      if (!error && kind === 'photo' && !PHOTO_TYPES.includes(file.type)) error = 'Photos must be JPEG, PNG or WebP images.';
      if (!error && kind === 'model' && !/\.(stl|3mf)$/i.test(file.name))
        error = 'Model files must be STL or 3MF. Put CAD files (STEP and the like) under source files.';
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

  /** The files step's messages. */
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

  return {
    files,
    existing,
    drawnInInches,
    modelFiles,
    photoFiles,
    sourceFiles,
    keptModels,
    clearFiles,
    addFiles,
    removeFile,
    makeCover,
    setDrawnInInches,
    filesSaved,
    fileRemoved,
    fileIssues,
  };
}
