// The one place in the client that calls fetch: JSON in and out, the CSRF token, and the API's
// error shape turned into ApiError.
import type { ApiErrorBody } from '@shared/types';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

export function isApiError(err: unknown): err is ApiError {
  return err instanceof ApiError;
}

let csrfToken: string | null = null;

async function fetchCsrfToken(): Promise<string> {
  let res: Response;
  try {
    res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'Rigshelf cannot be reached. Check the connection and try again.');
  }
  const body = (await res.json()) as { csrfToken: string };
  csrfToken = body.csrfToken;
  return csrfToken;
}

/** The session changes at sign-in and sign-out, and the CSRF token with it. */
export function forgetCsrfToken() {
  csrfToken = null;
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';

/** Told when a GET was answered by the copy the service worker keeps for no signal (src/sw.ts). */
let storedCopyListener: ((path: string, storedAt: string) => void) | null = null;
export function onStoredCopy(listener: (path: string, storedAt: string) => void) {
  storedCopyListener = listener;
}

async function send<T>(method: Method, path: string, body?: unknown, retried = false, extraHeaders: Record<string, string> = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json', ...extraHeaders };
  const isForm = typeof FormData !== 'undefined' && body instanceof FormData;
  if (body !== undefined && !isForm) headers['Content-Type'] = 'application/json';
  if (method !== 'GET') headers['X-CSRF-Token'] = csrfToken ?? (await fetchCsrfToken());

  let res: Response;
  try {
    res = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : isForm ? (body as FormData) : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', 'Rigshelf cannot be reached. Check the connection and try again.');
  }

  const storedAt = method === 'GET' ? res.headers.get('x-rigshelf-stored-at') : null;
  if (storedAt) storedCopyListener?.(path, storedAt);
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  const data = text ? (JSON.parse(text) as unknown) : undefined;
  if (res.ok) return data as T;

  const error = (data as ApiErrorBody | undefined)?.error;
  if (res.status === 403 && error?.code === 'csrf_invalid' && !retried) {
    await fetchCsrfToken();
    return send<T>(method, path, body, true, extraHeaders);
  }
  throw new ApiError(res.status, error?.code ?? 'http_' + res.status, error?.message ?? `Request failed (${res.status}).`, error?.fields);
}

/** Raw bytes of a download (a model file for the 3D view), with the API's errors as ApiError. */
async function bytes(path: string): Promise<ArrayBuffer> {
  let res: Response;
  try {
    res = await fetch(path, { credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'Rigshelf cannot be reached. Check the connection and try again.');
  }
  if (res.ok) return res.arrayBuffer();
  let error: ApiErrorBody['error'] | undefined;
  try {
    error = ((await res.json()) as ApiErrorBody).error;
  } catch {
    error = undefined;
  }
  throw new ApiError(res.status, error?.code ?? 'http_' + res.status, error?.message ?? `Download failed (${res.status}).`, error?.fields);
}

/** A POST whose answer is a file (a made part): its bytes and the name the server gave it. */
async function postForFile(path: string, body: unknown, retried = false): Promise<{ bytes: ArrayBuffer; fileName: string | null }> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', 'X-CSRF-Token': csrfToken ?? (await fetchCsrfToken()) },
      credentials: 'same-origin',
      body: JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', 'Rigshelf cannot be reached. Check the connection and try again.');
  }
  if (res.ok) {
    const name = /filename="?([^";]+)"?/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? null;
    return { bytes: await res.arrayBuffer(), fileName: name };
  }
  const error = ((await res.json().catch(() => undefined)) as ApiErrorBody | undefined)?.error;
  if (res.status === 403 && error?.code === 'csrf_invalid' && !retried) {
    await fetchCsrfToken();
    return postForFile(path, body, true);
  }
  throw new ApiError(res.status, error?.code ?? 'http_' + res.status, error?.message ?? `Download failed (${res.status}).`, error?.fields);
}

export const http = {
  get: <T>(path: string) => send<T>('GET', path),
  bytes,
  postForFile,
  post: <T>(path: string, body?: unknown) => send<T>('POST', path, body ?? {}),
  patch: <T>(path: string, body: unknown) => send<T>('PATCH', path, body),
  put: <T>(path: string, body: unknown) => send<T>('PUT', path, body),
  delete: <T>(path: string) => send<T>('DELETE', path),
  /** A POST that may be sent again (queued offline, resent after a lost answer): the server files it once per key. */
  postOnce: <T>(path: string, body: unknown, idempotencyKey: string) => send<T>('POST', path, body, false, { 'Idempotency-Key': idempotencyKey }),
};
