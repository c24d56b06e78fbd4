import type { ApiErrorBody } from '@shared/schemas/auth';

export type ApiErrorDetail = { path: string; message: string };

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: ApiErrorDetail[];
  readonly errorId?: string;
  /** Seconds from a 429's Retry-After header, when the server sent one. */
  readonly retryAfterSeconds?: number;

  constructor(init: {
    status: number;
    code: string;
    message: string;
    details?: ApiErrorDetail[];
    errorId?: string;
    retryAfterSeconds?: number;
  }) {
    super(init.message);
    this.name = 'ApiError';
    this.status = init.status;
    this.code = init.code;
    this.details = init.details ?? [];
    this.errorId = init.errorId;
    this.retryAfterSeconds = init.retryAfterSeconds;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

/**
 * The thing an address names does not exist: a 404, or a 400 about the address alone (`params.*`, a
 * mistyped id). Pages show their "not found" for it rather than the server's words.
 */
export function isNotFoundError(error: unknown): boolean {
  if (!isApiError(error)) return false;
  if (error.status === 404) return true;
  return (
    error.status === 400 && error.details.length > 0 && error.details.every((d) => d.path === 'params' || d.path.startsWith('params.'))
  );
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export type RequestOptions = {
  signal?: AbortSignal;
  /** Sign-in, sign-up and sign-out regenerate the session, so the CSRF token bound to it must be fetched again. */
  rotatesSession?: boolean;
};

const CSRF_HEADER = 'x-csrf-token';
let csrfToken: Promise<string> | null = null;

function fetchCsrfToken(): Promise<string> {
  if (!csrfToken) {
    csrfToken = send<{ csrfToken: string }>('GET', '/api/auth/csrf')
      .then((body) => body.csrfToken)
      .catch((error: unknown) => {
        csrfToken = null;
        throw error;
      });
  }
  return csrfToken;
}

export function forgetCsrfToken(): void {
  csrfToken = null;
}

function parseRetryAfter(value: string | null): number | undefined {
  if (!value) return undefined;
  const seconds = Number(value);
  if (Number.isFinite(seconds)) return Math.max(0, Math.ceil(seconds));
  const date = Date.parse(value);
  return Number.isNaN(date) ? undefined : Math.max(0, Math.ceil((date - Date.now()) / 1000));
}

async function toApiError(response: Response): Promise<ApiError> {
  const retryAfterSeconds = parseRetryAfter(response.headers.get('retry-after'));
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    // Not JSON (a proxy error page, for instance): fall through to a generic message.
  }
  const error = (body as Partial<ApiErrorBody> | null)?.error;
  if (error && typeof error.code === 'string') {
    return new ApiError({
      status: response.status,
      code: error.code,
      message: error.message || `Request failed (${response.status})`,
      details: Array.isArray(error.details) ? error.details : [],
      errorId: error.errorId,
      retryAfterSeconds,
    });
  }
  return new ApiError({
    status: response.status,
    code: `http.${response.status}`,
    message:
      response.status >= 500
        ? 'The server could not complete the request. Please try again in a moment.'
        : `Request failed (${response.status} ${response.statusText})`,
    retryAfterSeconds,
  });
}

async function send<T>(method: Method, path: string, body?: unknown, options: RequestOptions = {}, csrf?: string): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  const isForm = typeof FormData !== 'undefined' && body instanceof FormData;
  // A form (a file upload) sets its own multipart content type with the boundary.
  if (body !== undefined && !isForm) headers['content-type'] = 'application/json';
  if (csrf) headers[CSRF_HEADER] = csrf;

  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers,
      body: body === undefined ? undefined : isForm ? body : JSON.stringify(body),
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError({
      status: 0,
      code: 'network.unreachable',
      message: 'Could not reach Lightkeel. Check your connection and try again.',
    });
  }

  if (!response.ok) throw await toApiError(response);
  if (response.status === 204 || response.status === 205) return undefined as T;
  const text = await response.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

async function request<T>(method: Method, path: string, body?: unknown, options: RequestOptions = {}): Promise<T> {
  if (method === 'GET') return send<T>(method, path, undefined, options);

  const attempt = async () => send<T>(method, path, body, options, await fetchCsrfToken());
  let result: T;
  try {
    result = await attempt();
  } catch (error) {
    if (!(error instanceof ApiError && error.status === 403 && error.code === 'csrf.invalid')) throw error;
    // The session may have been regenerated elsewhere (another tab signed in or out): one fresh token, one retry.
    forgetCsrfToken();
    result = await attempt();
  }
  if (options.rotatesSession) forgetCsrfToken();
  return result;
}

export const api = {
  get: <T>(path: string, options?: RequestOptions) => request<T>('GET', path, undefined, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('POST', path, body, options),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PUT', path, body, options),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('PATCH', path, body, options),
  delete: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('DELETE', path, body, options),
};

/** Build `path?key=value` from the defined entries only. */
export function withQuery(path: string, params: Record<string, string | number | undefined | null>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== null && value !== '') search.set(key, String(value));
  }
  const query = search.toString();
  return query ? `${path}?${query}` : path;
}
