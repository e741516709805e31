// Typed calls to the Rigshelf API, grouped by feature.
import type { PartCreated, PartDetail, PartHistoryItem, PartList, Vocab } from '@shared/api/parts';
import type { AdminUserPatch, LoginInput, RegisterInput } from '@shared/schemas/auth';
import type { PartSubmission, PartUpdate } from '@shared/schemas/part';
import type { HealthStatus, PartSummary, PublicUser } from '@shared/types';
import { forgetCsrfToken, http } from './http';

export { ApiError, isApiError } from './http';
export type { PartCreated, PartDetail, PartHistoryItem, PartList, Vocab } from '@shared/api/parts';

export const authApi = {
  async me(): Promise<PublicUser | null> {
    try {
      return (await http.get<{ user: PublicUser }>('/api/auth/me')).user;
    } catch (err) {
      if ((err as { status?: number }).status === 401) return null;
      throw err;
    }
  },
  async login(input: LoginInput): Promise<PublicUser> {
    const { user } = await http.post<{ user: PublicUser }>('/api/auth/login', input);
    forgetCsrfToken();
    return user;
  },
  async register(input: RegisterInput): Promise<PublicUser> {
    const { user } = await http.post<{ user: PublicUser }>('/api/auth/register', input);
    forgetCsrfToken();
    return user;
  },
  async logout(): Promise<void> {
    await http.post<void>('/api/auth/logout');
    forgetCsrfToken();
  },
};

export const adminApi = {
  users: async () => (await http.get<{ users: PublicUser[] }>('/api/admin/users')).users,
  updateUser: async (id: number, patch: AdminUserPatch) =>
    (await http.patch<{ user: PublicUser }>(`/api/admin/users/${id}`, patch)).user,
};

export const healthApi = {
  get: () => http.get<HealthStatus>('/api/health'),
};

/** Files of a submission, by the multipart field they go in. */
export interface PartUploadFiles {
  model?: File[];
  photo?: File[];
  source?: File[];
}

function appendFiles(form: FormData, files: PartUploadFiles) {
  for (const field of ['model', 'photo', 'source'] as const) {
    for (const file of files[field] ?? []) form.append(field, file, file.name);
  }
}

const partPath = (id: number | string) => `/api/parts/${encodeURIComponent(String(id))}`;

export const partsApi = {
  vocab: () => http.get<Vocab>('/api/vocab'),
  /** Everything the signed-in member has submitted, newest change first. */
  mine: async (): Promise<PartSummary[]> => (await http.get<PartList>('/api/parts?mine=1')).items,
  /** What is on the shelf, newest first. */
  published: async (): Promise<PartSummary[]> => (await http.get<PartList>('/api/parts')).items,
  /** By numeric id or slug. */
  get: (idOrSlug: number | string) => http.get<PartDetail>(partPath(idOrSlug)),
  submit(input: PartSubmission, files: PartUploadFiles): Promise<PartCreated> {
    const form = new FormData();
    form.append('data', JSON.stringify(input));
    appendFiles(form, files);
    return http.post<PartCreated>('/api/parts', form);
  },
  update: (id: number, patch: PartUpdate) => http.patch<PartDetail>(partPath(id), patch),
  addFiles(id: number, files: PartUploadFiles, options: { drawnInInches: boolean }): Promise<PartDetail> {
    const form = new FormData();
    form.append('drawnInInches', String(options.drawnInInches));
    appendFiles(form, files);
    return http.post<PartDetail>(`${partPath(id)}/files`, form);
  },
  /** The review desk's decisions on a part, oldest first (its author and moderators only). */
  history: async (id: number): Promise<PartHistoryItem[]> =>
    (await http.get<{ items: PartHistoryItem[] }>(`${partPath(id)}/history`)).items,
  removeFile: (id: number, fileId: number) => http.delete<PartDetail>(`${partPath(id)}/files/${fileId}`),
  /** The bytes behind a file's downloadUrl (signed-in only). */
  fileBytes: (downloadUrl: string) => http.bytes(downloadUrl),
};
