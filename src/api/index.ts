// Typed calls to the Rigshelf API, grouped by feature.
import type { PartCreated, PartDetail, PartHistoryItem, PartList, Vocab } from '@shared/api/parts';
import type { CrewInfo, CrewInvitationInfo, CrewSummary, InvitationPreview } from '@shared/api/crews';
import type { CrewInput as CrewFormInput, CrewRole } from '@shared/schemas/crews';
import type {
  CrewProfile,
  Evidence,
  EvidenceEntryType,
  FlaggedEntry,
  FlagResult,
  HideResult,
  PartRatings,
  RatingSaved,
  ReportFiled,
  SetReportList,
} from '@shared/api/evidence';
import type { RatingInput, SetReportInput } from '@shared/schemas/evidence';
import type { AdminUserPatch, LoginInput, RegisterInput } from '@shared/schemas/auth';
import type { PartSubmission, PartUpdate } from '@shared/schemas/part';
import type { HealthStatus, PartSummary, PublicUser } from '@shared/types';
import type { NoticeList, ReviewDecisionResult, ReviewDetail, ReviewQueueItem } from '@shared/api/review';
import type { ReviewAction } from '@shared/review';
import { newWriteKey } from '@/lib/write-key';
import type { CameraBodyInfo, MailboxMessage, OutboxItem } from '@shared/types';
import type { CameraBodyInput } from '@shared/schemas/vocab';
import type {
  EstimateResult,
  KitDetail,
  KitItemInfo,
  KitList,
  KitListItem,
  KitCrewShareList,
  KitShareList,
  KitSummaryResponse,
  PrinterInfo,
  PrinterList,
  PriceSheetInfo,
} from '@shared/api/planning';
import type {
  EstimateInput,
  KitInput,
  KitItemInput,
  KitItemPatch,
  KitPatch,
  KitSharesInput,
  PriceSheetInput,
  PrinterInput,
  PrinterPatch,
} from '@shared/schemas/planning';
import type { SearchResponse } from '@shared/api/search';
import type { CalibrationInfo, CalibrationList, MakePreview, MakerInfo, MakerList } from '@shared/api/make';
import type { CalibrationInput, MadeKitItemInput, MakeFormat, MakeRequest } from '@shared/schemas/make';
import type { BuildInfo, BuildList } from '@shared/api/builds';
import type { WantedDetail, WantedList, WantedListItem } from '@shared/api/wanted';
import type { BuildInput, BuildPatch } from '@shared/schemas/builds';
import type { WantedAnswerInput, WantedCloseInput, WantedInput } from '@shared/schemas/wanted';
import type { SearchSort } from '@shared/schemas/search';
import type { CrewPrinter, PrintRequestDetail, PrintRequestList } from '@shared/api/print-requests';
import type { StatementInfo } from '@shared/api/statement';
import type { PrintRequestAction } from '@shared/print-requests';
import type { PrintRequestInput, StatementDetailsInput } from '@shared/schemas/print-requests';
import type { KitRecallInfo, NoticePreferenceInfo, NoticePreferencesInput } from '@shared/schemas/notices';
import { forgetCsrfToken, http } from './http';

export { ApiError, isApiError } from './http';
export type { PartCreated, PartDetail, PartHistoryItem, PartList, Vocab } from '@shared/api/parts';
export type * from '@shared/api/evidence';
export type { SearchResponse, SearchResultItem } from '@shared/api/search';

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
  /** Always the same answer ("check your mail"): nobody is signed in by registering. */
  async register(input: RegisterInput): Promise<string> {
    return (await http.post<{ message: string }>('/api/auth/register', input)).message;
  },
  async logout(): Promise<void> {
    await http.post<void>('/api/auth/logout');
    forgetCsrfToken();
  },
};

export const adminApi = {
  users: async () => (await http.get<{ users: PublicUser[] }>('/api/admin/users')).users,
  updateUser: async (id: number, patch: AdminUserPatch) => (await http.patch<{ user: PublicUser }>(`/api/admin/users/${id}`, patch)).user,
  addBody: async (input: CameraBodyInput) => (await http.post<{ body: CameraBodyInfo }>('/api/admin/bodies', input)).body,
  updateBody: async (slug: string, patch: Partial<CameraBodyInput>) =>
    (await http.patch<{ body: CameraBodyInfo }>(`/api/admin/bodies/${encodeURIComponent(slug)}`, patch)).body,
  removeBody: (slug: string) => http.delete<void>(`/api/admin/bodies/${encodeURIComponent(slug)}`),
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
  /** `key` stays the same while one draft is sent again, so a submission whose answer was lost is filed once. */
  submit(input: PartSubmission, files: PartUploadFiles, key: string): Promise<PartCreated> {
    const form = new FormData();
    form.append('data', JSON.stringify(input));
    appendFiles(form, files);
    return http.postOnce<PartCreated>('/api/parts', form, key);
  },
  update: (id: number, patch: PartUpdate) => http.patch<PartDetail>(partPath(id), patch),
  addFiles(id: number, files: PartUploadFiles, options: { drawnInInches: boolean }): Promise<PartDetail> {
    const form = new FormData();
    form.append('drawnInInches', String(options.drawnInInches));
    appendFiles(form, files);
    return http.post<PartDetail>(`${partPath(id)}/files`, form);
  },
  /** The review desk's decisions on a part, oldest first (its author and moderators only). */
  history: async (id: number): Promise<PartHistoryItem[]> => (await http.get<{ items: PartHistoryItem[] }>(`${partPath(id)}/history`)).items,
  removeFile: (id: number, fileId: number) => http.delete<PartDetail>(`${partPath(id)}/files/${fileId}`),
  /** The bytes behind a file's downloadUrl (signed-in only). */
  fileBytes: (downloadUrl: string) => http.bytes(downloadUrl),
};

export const reviewApi = {
  queue: async (): Promise<ReviewQueueItem[]> => (await http.get<{ items: ReviewQueueItem[] }>('/api/review/queue')).items,
  detail: (partId: number) => http.get<ReviewDetail>(`/api/review/${partId}`),
  decide: (partId: number, action: Exclude<ReviewAction, 'submit'>, body: { note?: string; checklist?: string[] }) =>
    http.post<ReviewDecisionResult>(`/api/review/${partId}/${action}`, body),
  resubmit: (id: number) => http.post<PartDetail>(`${partPath(id)}/submit`),
};

export const noticesApi = {
  list: () => http.get<NoticeList>('/api/notices'),
  read: (id: number) => http.post<void>(`/api/notices/${id}/read`),
  readAll: () => http.post<void>('/api/notices/read-all'),
};

export const mailApi = {
  outbox: async (): Promise<OutboxItem[]> => (await http.get<{ items: OutboxItem[] }>('/api/admin/mail')).items,
  retry: (id: number) => http.post<{ item: OutboxItem }>(`/api/admin/mail/${id}/retry`),
  mailbox: async (): Promise<MailboxMessage[]> => (await http.get<{ items: MailboxMessage[] }>('/api/dev/mailbox')).items,
};

export const accountApi = {
  verifyEmail: async (token: string) => (await http.post<{ user: PublicUser }>('/api/auth/verify-email', { token })).user,
  resendVerification: () => http.post<{ message: string }>('/api/auth/verify-email/resend'),
  requestReset: (email: string) => http.post<{ message: string }>('/api/auth/password-reset/request', { email }),
  resetPassword: (token: string, password: string) => http.post<{ message: string }>('/api/auth/password-reset', { token, password }),
};

const kitPath = (id: number) => `/api/kits/${encodeURIComponent(String(id))}`;

/** Prep day: print estimates, the member's printers and filament prices, shoot kits. */
export const planningApi = {
  estimate: (input: EstimateInput) => http.post<EstimateResult>('/api/estimate', input),

  printers: async (): Promise<PrinterInfo[]> => (await http.get<PrinterList>('/api/printers')).items,
  createPrinter: (input: PrinterInput) => http.post<PrinterInfo>('/api/printers', input),
  updatePrinter: (id: number, patch: PrinterPatch) => http.patch<PrinterInfo>(`/api/printers/${id}`, patch),
  deletePrinter: (id: number) => http.delete<void>(`/api/printers/${id}`),

  prices: () => http.get<PriceSheetInfo>('/api/me/prices'),
  /** Replaces the sheet: materials left out go back to the default price. */
  setPrices: (input: PriceSheetInput) => http.put<PriceSheetInfo>('/api/me/prices', input),

  /** The member's own kits and those shared with them, last changed first. */
  kits: async (): Promise<KitListItem[]> => (await http.get<KitList>('/api/kits')).items,
  kit: (id: number) => http.get<KitDetail>(kitPath(id)),
  createKit: (input: KitInput) => http.post<KitDetail>('/api/kits', input),
  updateKit: (id: number, patch: KitPatch) => http.patch<KitDetail>(kitPath(id), patch),
  deleteKit: (id: number) => http.delete<void>(kitPath(id)),
  /** Takes the signed-in member off a kit someone shared with them. */
  leaveKit: (id: number) => http.delete<void>(`${kitPath(id)}/shares/me`),
  addItem: (kitId: number, input: KitItemInput, key: string = newWriteKey()) => http.postOnce<KitItemInfo>(`${kitPath(kitId)}/items`, input, key),
  updateItem: (kitId: number, itemId: number, patch: KitItemPatch) => http.patch<KitItemInfo>(`${kitPath(kitId)}/items/${itemId}`, patch),
  removeItem: (kitId: number, itemId: number) => http.delete<void>(`${kitPath(kitId)}/items/${itemId}`),
  /** Replaces who the kit is shared with (owner only). */
  setShares: (kitId: number, input: KitSharesInput) => http.put<KitShareList>(`${kitPath(kitId)}/shares`, input),
  summary: (kitId: number) => http.get<KitSummaryResponse>(`${kitPath(kitId)}/summary`),
  /** For a plain download link: the browser sends the session cookie itself. */
  csvUrl: (kitId: number) => `${kitPath(kitId)}/export.csv`,
};

/** Which set reports to list; every filter is optional. */
export interface ReportFilter {
  material?: string;
  condition?: string;
  outcome?: string;
}

export const evidenceApi = {
  /** Every visible rating of a part, the star distribution and the member's own rating. */
  ratings: (partId: number | string) => http.get<PartRatings>(`${partPath(partId)}/ratings`),
  /** Rates a part (again: the new rating replaces the old one). Not for the part's author. */
  rate: (partId: number | string, input: RatingInput) => http.post<RatingSaved>(`${partPath(partId)}/ratings`, input),
  async reports(partId: number | string, filter: ReportFilter = {}): Promise<SetReportList['items']> {
    const query = new URLSearchParams(Object.entries(filter).filter((e): e is [string, string] => !!e[1]));
    const qs = query.toString();
    return (await http.get<SetReportList>(`${partPath(partId)}/reports${qs ? `?${qs}` : ''}`)).items;
  },
  fileReport(partId: number | string, input: SetReportInput, photos: File[] = []): Promise<ReportFiled> {
    const form = new FormData();
    form.append('data', JSON.stringify(input));
    for (const photo of photos) form.append('photo', photo, photo.name);
    return http.post<ReportFiled>(`${partPath(partId)}/reports`, form);
  },
  /** The proven figure, the counts behind it, the rating summary and the warnings. */
  proven: (partId: number | string) => http.get<Evidence>(`${partPath(partId)}/proven`),
  flag: (type: EvidenceEntryType, id: number, reason: string) => http.post<FlagResult>(`/api/${type}s/${id}/flag`, { reason }),
  /** Moderators: flagged entries waiting for a decision, oldest flag first. */
  flagged: async (): Promise<FlaggedEntry[]> => (await http.get<{ items: FlaggedEntry[] }>('/api/review/flags')).items,
  /** Moderators: takes an entry out of every score; the note is required. */
  hide: (type: EvidenceEntryType, id: number, note: string) => http.post<HideResult>(`/api/review/${type}s/${id}/hide`, { note }),
  profile: (userId: number | string) => http.get<CrewProfile>(`/api/users/${encodeURIComponent(String(userId))}/profile`),
};

/** One shelf search, as GET /api/search takes it (lists repeat their key; empty values are left out). */
export interface SearchParams {
  q?: string;
  body?: string[];
  mount?: string[];
  category?: string[];
  material?: string[];
  /** The space a part must fit in, as typed: "120x80x40", "4.5inx3inx1in". */
  fit?: string;
  /** Key dimensions as name:value:tolerance, e.g. "rod bore:15:0.3". */
  dim?: string[];
  adaptable?: boolean;
  minRating?: number;
  sort?: SearchSort;
  page?: number;
  pageSize?: number;
  /** One of the member's builds: fitting parts first, each marked (see buildsApi). */
  build?: number;
}

export const searchApi = {
  /** Published parts matching the text and every filter, with facet counts over all matches. */
  search(params: SearchParams): Promise<SearchResponse> {
    const query = new URLSearchParams();
    for (const [key, value] of Object.entries(params) as [string, SearchParams[keyof SearchParams]][]) {
      if (value === undefined || value === '' || value === false) continue;
      for (const one of Array.isArray(value) ? value : [value]) if (one !== '') query.append(key, one === true ? '1' : String(one));
    }
    const qs = query.toString();
    return http.get<SearchResponse>(`/api/search${qs ? `?${qs}` : ''}`);
  },
};

// ---- camera builds and wanted parts --------------------------------------------------------------

export type { BuildInfo, BuildSearchResponse, BuildSearchResultItem, FitMark } from '@shared/api/builds';
export type { WantedDetail, WantedListItem } from '@shared/api/wanted';

/** The member's own camera builds. */
export const buildsApi = {
  list: async (): Promise<BuildInfo[]> => (await http.get<BuildList>('/api/builds')).items,
  get: (id: number) => http.get<BuildInfo>(`/api/builds/${id}`),
  create: (input: BuildInput) => http.post<BuildInfo>('/api/builds', input),
  update: (id: number, patch: BuildPatch) => http.patch<BuildInfo>(`/api/builds/${id}`, patch),
  remove: (id: number) => http.delete<void>(`/api/builds/${id}`),
};

/** The crew's board of wanted parts. */
export const wantedApi = {
  list: async (status: 'open' | 'closed' | 'mine' = 'open', limit?: number): Promise<WantedListItem[]> =>
    (await http.get<WantedList>(`/api/wanted?status=${status}${limit ? `&limit=${limit}` : ''}`)).items,
  get: (id: number) => http.get<WantedDetail>(`/api/wanted/${id}`),
  create(input: WantedInput, photos: File[] = []): Promise<WantedDetail> {
    if (!photos.length) return http.post<WantedDetail>('/api/wanted', input);
    const form = new FormData();
    form.append('data', JSON.stringify(input));
    for (const photo of photos) form.append('photo', photo, photo.name);
    return http.post<WantedDetail>('/api/wanted', form);
  },
  answer: (id: number, input: WantedAnswerInput) => http.post<{ id: number; onShelf: boolean }>(`/api/wanted/${id}/answers`, input),
  close: (id: number, input: WantedCloseInput) => http.post<{ id: number; status: 'closed' }>(`/api/wanted/${id}/close`, input),
};

const makePath = (kind: string) => `/api/make/${encodeURIComponent(kind)}`;

export const makeApi = {
  makers: async (): Promise<MakerInfo[]> => (await http.get<MakerList>('/api/make')).items,
  /** Measured, estimated and checked on the server (the browser draws its own preview meanwhile). */
  preview: (kind: string, input: Partial<MakeRequest>) => http.post<MakePreview>(`${makePath(kind)}/preview`, input),
  file: (kind: string, input: Partial<MakeRequest>, format: MakeFormat) => http.postForFile(`${makePath(kind)}/file?format=${format}`, input),
  calibrations: async (printerId: number): Promise<CalibrationInfo[]> => (await http.get<CalibrationList>(`/api/printers/${printerId}/calibrations`)).items,
  calibrate: (printerId: number, input: CalibrationInput) => http.post<CalibrationInfo>(`/api/printers/${printerId}/calibrations`, input),
  addToKit: (kitId: number, input: Partial<MadeKitItemInput> & Pick<MadeKitItemInput, 'kind' | 'params'>) =>
    http.post<KitItemInfo>(`/api/kits/${kitId}/made`, input),
};

// ---- print requests and statements ---------------------------------------------------------------

export type { CrewPrinter, PrintRequestDetail, PrintRequestInfo, PrintRequestList } from '@shared/api/print-requests';
export type { StatementInfo } from '@shared/api/statement';

/** Asking crew mates for prints, the steps, paying back. */
export const printRequestsApi = {
  list: () => http.get<PrintRequestList>('/api/print-requests'),
  printers: async (): Promise<CrewPrinter[]> => (await http.get<{ items: CrewPrinter[] }>('/api/print-requests/printers')).items,
  get: (id: number) => http.get<PrintRequestDetail>(`/api/print-requests/${id}`),
  create: (input: PrintRequestInput) => http.post<PrintRequestDetail>('/api/print-requests', input),
  step: (id: number, action: PrintRequestAction, note?: string | null) =>
    http.post<PrintRequestDetail>(`/api/print-requests/${id}/${action}`, { note: note || null }),
  checkout: (id: number) => http.post<{ url: string | null; clientSecret: string | null }>(`/api/print-requests/${id}/checkout`),
};

/** A kit's statement for the production office. */
export const statementApi = {
  get: (kitId: number) => http.get<StatementInfo>(`/api/kits/${kitId}/statement`),
  save: (kitId: number, input: StatementDetailsInput) => http.put<void>(`/api/kits/${kitId}/statement`, input),
  fileUrl: (kitId: number, ext: 'csv' | 'pdf') => `/api/kits/${kitId}/statement.${ext}`,
};

const crewPath = (id: number) => `/api/crews/${encodeURIComponent(String(id))}`;

/** Crews: the member's crews, their members, invitations and crew roles. */
export const crewsApi = {
  list: async (): Promise<CrewSummary[]> => (await http.get<{ items: CrewSummary[] }>('/api/crews')).items,
  get: (id: number) => http.get<CrewInfo>(crewPath(id)),
  create: (input: CrewFormInput) => http.post<CrewInfo>('/api/crews', input),
  update: (id: number, patch: Partial<CrewFormInput>) => http.patch<CrewInfo>(crewPath(id), patch),
  remove: (id: number) => http.delete<void>(crewPath(id)),
  invite: (id: number, input: { email: string; role: CrewRole }) => http.post<CrewInvitationInfo>(`${crewPath(id)}/invitations`, input),
  withdrawInvitation: (id: number, invitationId: number) => http.delete<void>(`${crewPath(id)}/invitations/${invitationId}`),
  setRole: (id: number, userId: number, role: CrewRole) => http.patch<CrewInfo>(`${crewPath(id)}/members/${userId}`, { role }),
  /** A lead removes a member; with the viewer's own id, they leave. */
  removeMember: (id: number, userId: number) => http.delete<void>(`${crewPath(id)}/members/${userId}`),
  invitation: (token: string) => http.get<InvitationPreview>(`/api/invitations/${encodeURIComponent(token)}`),
  accept: (token: string) => http.post<CrewInfo>(`/api/invitations/${encodeURIComponent(token)}/accept`),
  /** Replaces the crews a kit is shared with (kit owner only). */
  setKitCrewShares: (kitId: number, crewShares: { crewId: number; access: 'read' | 'edit' }[]) =>
    http.put<KitCrewShareList>(`${kitPath(kitId)}/crew-shares`, { crewShares }),
};

/** Which notices the member hears about, and the recall banners on a kit. */
export const alertsApi = {
  preferences: async (): Promise<NoticePreferenceInfo[]> => (await http.get<{ preferences: NoticePreferenceInfo[] }>('/api/notices/settings')).preferences,
  setPreferences: async (input: NoticePreferencesInput): Promise<NoticePreferenceInfo[]> =>
    (await http.put<{ preferences: NoticePreferenceInfo[] }>('/api/notices/settings', input)).preferences,
  recalls: async (kitId: number): Promise<KitRecallInfo[]> => (await http.get<{ items: KitRecallInfo[] }>(`${kitPath(kitId)}/recalls`)).items,
  acknowledgeRecall: (kitId: number, recallId: number) => http.post<void>(`${kitPath(kitId)}/recalls/${recallId}/acknowledge`),
};

/** Set reports and ratings sent from the offline queue: each carries its key, so a repeat is filed once. */
export const queuedApi = {
  fileReport(partId: number, input: SetReportInput, photos: Blob[], key: string): Promise<ReportFiled> {
    const form = new FormData();
    form.append('data', JSON.stringify(input));
    photos.forEach((photo, i) => form.append('photo', photo, photo instanceof File ? photo.name : `photo-${i + 1}.jpg`));
    return http.postOnce<ReportFiled>(`${partPath(partId)}/reports`, form, key);
  },
  rate: (partId: number, input: RatingInput, key: string) => http.postOnce<RatingSaved>(`${partPath(partId)}/ratings`, input, key),
};
