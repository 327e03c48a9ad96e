import type { ErrorEnvelope, ErrorField } from '../../shared/api/error.js';

/** An API answer outside 2xx, carrying the server's error envelope. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly hint?: string,
    readonly fields: ErrorField[] = [],
    readonly details?: unknown,
  ) {
    super(message);
  }
}

let csrfToken = '';
export function setCsrfToken(token: string) {
  csrfToken = token;
}

async function ensureCsrf(): Promise<string> {
  if (!csrfToken) {
    const r = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
    csrfToken = (await r.json()).csrfToken;
  }
  return csrfToken;
}

type Listener = (e: ApiError) => void;
const unauthorisedListeners = new Set<Listener>();
/** The session layer listens for 401s to send the user back to sign-in. */
export function onUnauthorised(l: Listener) {
  unauthorisedListeners.add(l);
  return () => {
    unauthorisedListeners.delete(l);
  };
}

/** The one API client: JSON in and out, CSRF header on writes, error envelope to ApiError. */
export async function api<T>(method: string, url: string, body?: unknown, init: RequestInit = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const isForm = typeof FormData !== 'undefined' && body instanceof FormData;
  if (body !== undefined && !isForm) headers['Content-Type'] = 'application/json';
  if (method !== 'GET') headers['X-CSRF-Token'] = await ensureCsrf();
  const res = await fetch(url, { method, headers, credentials: 'same-origin', body: body === undefined ? undefined : isForm ? (body as FormData) : JSON.stringify(body), ...init });
  if (res.status === 204) return undefined as T;
  const type = res.headers.get('content-type') ?? '';
  const data = type.includes('json') ? await res.json() : await res.text();
  if (!res.ok) {
    const env = (data as ErrorEnvelope)?.error;
    const err = env
      ? new ApiError(res.status, env.code, env.message, env.hint, env.fields, env.details)
      : new ApiError(res.status, 'http_error', `the server answered ${res.status}`);
    if (err.code === 'csrf_failed') csrfToken = '';
    if (res.status === 401 && !url.startsWith('/api/auth/login')) unauthorisedListeners.forEach((l) => l(err));
    throw err;
  }
  return data as T;
}

export const get = <T>(url: string) => api<T>('GET', url);
export const post = <T>(url: string, body?: unknown) => api<T>('POST', url, body ?? {});
export const patch = <T>(url: string, body?: unknown) => api<T>('PATCH', url, body ?? {});
export const put = <T>(url: string, body?: unknown) => api<T>('PUT', url, body ?? {});
export const del = <T>(url: string) => api<T>('DELETE', url);

/** Builds a query string from defined values (arrays repeat the key). */
export function qs(params: Record<string, unknown>): string {
  const sp = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null || v === '') continue;
    if (Array.isArray(v)) v.forEach((x) => sp.append(k, String(x)));
    else sp.set(k, String(v));
  }
  const s = sp.toString();
  return s ? `?${s}` : '';
}

/** One tested way to turn anything thrown into words for the user. */
export function getErrorMessage(err: unknown): string {
  if (err instanceof ApiError) return err.hint ? `${err.message}. ${capitalise(err.hint)}.` : `${err.message}.`;
  if (err instanceof Error) return err.message;
  return 'Something went wrong.';
}

function capitalise(s: string) {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
