import type { ApiErrorBody } from '../../shared/schemas/common';

/** The one error type every screen sees, whatever went wrong on the way. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string>;
  /** Seconds to wait, from Retry-After on a 429. */
  readonly retryAfter: number | null;

  constructor(init: { status: number; code: string; message: string; fields?: Record<string, string>; retryAfter?: number | null }) {
    super(init.message);
    this.name = 'ApiError';
    this.status = init.status;
    this.code = init.code;
    this.fields = init.fields ?? {};
    this.retryAfter = init.retryAfter ?? null;
  }
}

export function isApiError(err: unknown, status?: number): err is ApiError {
  return err instanceof ApiError && (status === undefined || err.status === status);
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type Query = Record<string, string | number | boolean | null | undefined>;

export type RequestOptions = {
  method?: Method;
  body?: unknown;
  query?: Query;
  signal?: AbortSignal;
  /**
   * The server gives the session a new id on sign-in, sign-up, invitation accept, password reset
   * and logout; the CSRF token belongs to the old session, so fetch a new one afterwards.
   */
  rotatesSession?: boolean;
};

const MUTATING = new Set<Method>(['POST', 'PUT', 'PATCH', 'DELETE']);

let csrfToken: string | null = null;
let csrfRequest: Promise<string> | null = null;

function fetchCsrfToken(): Promise<string> {
  if (!csrfRequest) {
    const request = send<{ token: string }>('/api/auth/csrf', { method: 'GET' }).then(
      (res) => {
        csrfToken = res.token;
        return res.token;
      },
    );
    csrfRequest = request;
    // A failed fetch must not stick: the next mutation tries again.
    request.catch(() => undefined).finally(() => {
      if (csrfRequest === request) csrfRequest = null;
    });
  }
  return csrfRequest;
}

async function csrf(): Promise<string> {
  return csrfToken ?? fetchCsrfToken();
}

/** Forget the token and start fetching the one for the new session. */
export function refreshCsrfToken(): void {
  csrfToken = null;
  csrfRequest = null;
  void fetchCsrfToken().catch(() => undefined);
}

function buildUrl(path: string, query?: Query): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}${path.includes('?') ? '&' : '?'}${qs}` : path;
}

function parseRetryAfter(header: string | null): number | null {
  if (!header) return null;
  const seconds = Number(header);
  if (Number.isFinite(seconds)) return Math.max(0, Math.ceil(seconds));
  const at = Date.parse(header);
  if (Number.isNaN(at)) return null;
  return Math.max(0, Math.ceil((at - Date.now()) / 1000));
}

const FALLBACK_MESSAGES: Record<number, string> = {
  400: 'Some of that did not look right. Check it and try again.',
  401: 'Please sign in to go on.',
  403: 'Your role in this studio does not allow that.',
  404: 'We could not find that. It may have been removed.',
  409: 'That clashes with something already saved. Reload and try again.',
  410: 'That link has been used or has expired.',
  413: 'That is too large to send.',
  415: 'That kind of file is not one we can take.',
  422: 'That cannot be done in the current state.',
  429: 'Too many attempts. Wait a little and try again.',
};

async function readErrorBody(res: Response): Promise<Partial<ApiErrorBody> | null> {
  try {
    return (await res.json()) as Partial<ApiErrorBody>;
  } catch {
    return null;
  }
}

async function toApiError(res: Response): Promise<ApiError> {
  return errorFrom(res.status, await readErrorBody(res), res.headers.get('Retry-After'));
}

function errorFrom(status: number, body: Partial<ApiErrorBody> | null, retryAfter: string | null): ApiError {
  const e = body?.error;
  return new ApiError({
    status,
    code: typeof e?.code === 'string' ? e.code : status >= 500 ? 'server_error' : `http_${status}`,
    message:
      typeof e?.message === 'string' && e.message
        ? e.message
        : (FALLBACK_MESSAGES[status] ?? 'Something went wrong on our side. Try again in a moment.'),
    fields: e?.fields && typeof e.fields === 'object' ? e.fields : undefined,
    retryAfter: parseRetryAfter(retryAfter),
  });
}

async function send<T>(path: string, opts: RequestOptions & { token?: string }): Promise<T> {
  const method = opts.method ?? 'GET';
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (opts.body !== undefined) headers['Content-Type'] = 'application/json';
  if (opts.token) headers['x-csrf-token'] = opts.token;

  let res: Response;
  try {
    res = await fetch(buildUrl(path, opts.query), {
      method,
      headers,
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      credentials: 'same-origin',
      signal: opts.signal,
    });
  } catch (err) {
    if (err instanceof DOMException && err.name === 'AbortError') throw err;
    throw new ApiError({
      status: 0,
      code: 'network',
      message: 'We could not reach Sablework. Check your connection and try again.',
    });
  }

  if (!res.ok) throw await toApiError(res);
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  if (!text) return undefined as T;
  try {
    return JSON.parse(text) as T;
  } catch {
    throw new ApiError({ status: res.status, code: 'bad_response', message: 'The server sent an answer we could not read. Try again in a moment.' });
  }
}

/** The only way the app talks to the API: JSON both ways, cookies same-origin, CSRF on every change. */
export async function api<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  const method = opts.method ?? 'GET';
  if (!MUTATING.has(method)) return send<T>(path, opts);

  try {
    const result = await send<T>(path, { ...opts, token: await csrf() });
    if (opts.rotatesSession) refreshCsrfToken();
    return result;
  } catch (err) {
    if (!(isApiError(err, 403) && err.code === 'csrf')) throw err;
    // The session changed under us (expired, or signed in elsewhere in this browser): once more with a fresh token.
    csrfToken = null;
    csrfRequest = null;
    const result = await send<T>(path, { ...opts, token: await fetchCsrfToken() });
    if (opts.rotatesSession) refreshCsrfToken();
    return result;
  }
}

export type UploadProgress = { loaded: number; total: number };

function sendForm<T>(path: string, form: FormData, token: string, opts: { onProgress?: (p: UploadProgress) => void; signal?: AbortSignal }): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.setRequestHeader('x-csrf-token', token);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) opts.onProgress?.({ loaded: e.loaded, total: e.total });
    };
    xhr.onload = () => {
      let body: unknown;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as T);
      else reject(errorFrom(xhr.status, body as Partial<ApiErrorBody> | null, xhr.getResponseHeader('Retry-After')));
    };
    xhr.onerror = () =>
      reject(new ApiError({ status: 0, code: 'network', message: 'The upload did not reach Sablework. Check your connection and try again.' }));
    xhr.onabort = () => reject(new DOMException('The upload was stopped.', 'AbortError'));
    opts.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(form);
  });
}

/**
 * Multipart upload with progress (fetch cannot report upload progress, XMLHttpRequest can). Same
 * CSRF handling and error shape as `api`; the browser sets the multipart boundary itself.
 */
export async function upload<T>(path: string, form: FormData, opts: { onProgress?: (p: UploadProgress) => void; signal?: AbortSignal } = {}): Promise<T> {
  try {
    return await sendForm<T>(path, form, await csrf(), opts);
  } catch (err) {
    if (!(isApiError(err, 403) && err.code === 'csrf')) throw err;
    csrfToken = null;
    csrfRequest = null;
    return sendForm<T>(path, form, await fetchCsrfToken(), opts);
  }
}
