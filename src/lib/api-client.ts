// The one way the client talks to the API. Every error becomes an ApiError with the server's
// stable code, so screens branch on `code`, never on message text.

export type FieldErrors = Record<string, string[]>;

export class ApiError extends Error {
  override readonly name = 'ApiError';
  /** HTTP status; 0 when the request never got an answer (offline, aborted, DNS). */
  readonly status: number;
  /** The server's stable error code, or 'network_error' / 'bad_response' from this client. */
  readonly code: string;
  readonly fields?: FieldErrors;

  constructor(status: number, code: string, message: string, fields?: FieldErrors) {
    super(message);
    this.status = status;
    this.code = code;
    this.fields = fields;
  }

  get isNetworkError(): boolean {
    return this.status === 0;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type QueryValue = string | number | boolean | null | undefined | readonly (string | number)[];

export interface RequestOptions {
  signal?: AbortSignal;
  /** Appended as a query string; null and undefined values are left out. */
  params?: Record<string, QueryValue>;
  headers?: Record<string, string>;
}

/**
 * Wiring to the session, set once by the app provider. The session lives in the auth
 * feature's query; keeping it behind this seam stops lib/ from importing a feature.
 */
interface SessionHooks {
  /** The CSRF token of the current session, from the cache or fetched if absent. */
  getCsrfToken: () => Promise<string>;
  /** Fetch a fresh session (and token), for when the server says the token is stale. */
  refreshCsrfToken: () => Promise<string>;
  /** The server no longer knows us: let the router send the user to sign-in. */
  onUnauthorized: () => void;
}

let sessionHooks: SessionHooks | null = null;

export function configureApiClient(hooks: SessionHooks): void {
  sessionHooks = hooks;
}

// GET /api/session answers 200 with user null rather than 401, and POST /api/session answers
// 401 for a wrong password: neither means "your session ended".
const SESSION_URL = '/api/session';

function buildUrl(url: string, params?: RequestOptions['params']): string {
  if (!params) return url;
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value === null || value === undefined) continue;
    if (Array.isArray(value)) for (const item of value) search.append(key, String(item));
    else search.append(key, String(value));
  }
  const query = search.toString();
  if (!query) return url;
  return url + (url.includes('?') ? '&' : '?') + query;
}

function isCsrfRejection(error: ApiError): boolean {
  return error.status === 403 && /csrf/i.test(error.code);
}

/** Turn a non-2xx answer into an ApiError, trusting only the documented error shape. */
function toApiError(status: number, body: unknown, statusText: string): ApiError {
  if (body && typeof body === 'object' && 'error' in body) {
    const err = (body as { error: unknown }).error;
    if (err && typeof err === 'object') {
      const { code, message, fields } = err as { code?: unknown; message?: unknown; fields?: unknown };
      return new ApiError(
        status,
        typeof code === 'string' ? code : 'unknown_error',
        typeof message === 'string' ? message : statusText || `Request failed (${status})`,
        fields && typeof fields === 'object' ? (fields as FieldErrors) : undefined,
      );
    }
  }
  return new ApiError(status, status >= 500 ? 'server_error' : 'bad_response', messageForStatus(status));
}

function messageForStatus(status: number): string {
  if (status === 401) return 'You are signed out. Sign in again to continue.';
  if (status === 403) return 'Your account is not allowed to do this.';
  if (status === 404) return 'That was not found.';
  if (status === 413) return 'That is too large to send.';
  if (status === 429) return 'Too many requests. Wait a moment and try again.';
  if (status >= 500) return 'The server had a problem. Try again in a moment.';
  return `The request failed (${status}).`;
}

function parseBody(text: string): unknown {
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

/** Something other than an API call (the socket) suggests the session ended: re-check it. */
export function reportSessionMayHaveEnded(): void {
  sessionHooks?.onUnauthorized();
}

function noteUnauthorized(url: string, error: ApiError): void {
  if (error.status === 401 && !url.startsWith(SESSION_URL)) sessionHooks?.onUnauthorized();
}

async function csrfHeader(method: string, fresh: boolean): Promise<Record<string, string>> {
  if (method === 'GET' || !sessionHooks) return {};
  const token = fresh ? await sessionHooks.refreshCsrfToken() : await sessionHooks.getCsrfToken();
  return { 'X-CSRF-Token': token };
}

async function request<T>(method: string, url: string, body: unknown, options: RequestOptions = {}, retried = false): Promise<T> {
  const target = buildUrl(url, options.params);
  const headers: Record<string, string> = { Accept: 'application/json', ...options.headers };
  let payload: BodyInit | undefined;
  if (body instanceof FormData) payload = body;
  else if (body !== undefined) {
    headers['Content-Type'] = 'application/json';
    payload = JSON.stringify(body);
  }

  let response: Response;
  try {
    Object.assign(headers, await csrfHeader(method, retried));
    response = await fetch(target, { method, headers, body: payload, credentials: 'same-origin', signal: options.signal });
  } catch (cause) {
    if (cause instanceof ApiError) throw cause;
    // Let TanStack Query see its own cancellations as such.
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, 'network_error', 'No connection to Faultline. Check the network and try again.');
  }

  const parsed = parseBody(await response.text().catch(() => ''));
  if (response.ok) return parsed as T;

  const error = toApiError(response.status, parsed, response.statusText);
  // A session that was renewed elsewhere (another tab signed in) carries a new token: fetch
  // it and try once more rather than failing the user's action.
  if (isCsrfRejection(error) && !retried && sessionHooks) return request<T>(method, url, body, options, true);
  noteUnauthorized(url, error);
  throw error;
}

/** Upload progress as a fraction from 0 to 1. */
export type ProgressHandler = (fraction: number) => void;

export interface UploadOptions {
  signal?: AbortSignal;
  method?: 'POST' | 'PUT' | 'PATCH';
}

// fetch() cannot report upload progress, so photos go through XMLHttpRequest.
async function upload<T>(url: string, formData: FormData, onProgress?: ProgressHandler, options: UploadOptions = {}): Promise<T> {
  try {
    return await uploadOnce<T>(url, formData, onProgress, options, false);
  } catch (error) {
    if (error instanceof ApiError && isCsrfRejection(error) && sessionHooks) {
      return uploadOnce<T>(url, formData, onProgress, options, true);
    }
    throw error;
  }
}

async function uploadOnce<T>(
  url: string,
  formData: FormData,
  onProgress: ProgressHandler | undefined,
  options: UploadOptions,
  freshToken: boolean,
): Promise<T> {
  const method = options.method ?? 'POST';
  const headers = await csrfHeader(method, freshToken);
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(method, url);
    xhr.setRequestHeader('Accept', 'application/json');
    for (const [name, value] of Object.entries(headers)) xhr.setRequestHeader(name, value);

    if (onProgress) {
      xhr.upload.onprogress = (event) => {
        if (event.lengthComputable && event.total > 0) onProgress(event.loaded / event.total);
      };
      xhr.upload.onload = () => onProgress(1);
    }
    xhr.onload = () => {
      const parsed = parseBody(xhr.responseText);
      if (xhr.status >= 200 && xhr.status < 300) {
        resolve(parsed as T);
        return;
      }
      const error = toApiError(xhr.status, parsed, xhr.statusText);
      noteUnauthorized(url, error);
      reject(error);
    };
    xhr.onerror = () => reject(new ApiError(0, 'network_error', 'The upload was interrupted. Check the network and try again.'));
    xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'));

    if (options.signal) {
      if (options.signal.aborted) {
        reject(new DOMException('The upload was cancelled.', 'AbortError'));
        return;
      }
      options.signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(formData);
  });
}

export const api = {
  get: <T>(url: string, options?: RequestOptions) => request<T>('GET', url, undefined, options),
  post: <T>(url: string, body?: unknown, options?: RequestOptions) => request<T>('POST', url, body, options),
  patch: <T>(url: string, body?: unknown, options?: RequestOptions) => request<T>('PATCH', url, body, options),
  put: <T>(url: string, body?: unknown, options?: RequestOptions) => request<T>('PUT', url, body, options),
  del: <T = void>(url: string, body?: unknown, options?: RequestOptions) => request<T>('DELETE', url, body, options),
  upload,
};
