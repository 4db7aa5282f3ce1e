import { apiErrorSchema, type ErrorCode } from '@shared/errors';

/** An API failure with the server's code, message and (for validation) the field. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: ErrorCode | string;
  readonly field: string | undefined;

  constructor(status: number, code: string, message: string, field?: string) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.field = field;
  }

  get isClientError(): boolean {
    return this.status >= 400 && this.status < 500;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

/**
 * The server's message for `field`, for display under that input: validation messages
 * read "field: problem", and the label already names the field, so the prefix goes.
 */
export function fieldErrorOf(error: unknown, field: string): string | null {
  if (!isApiError(error) || error.field !== field) return null;
  const text = error.message.startsWith(`${field}: `)
    ? error.message.slice(field.length + 2)
    : error.message;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  body?: unknown;
  query?: Record<string, string | number | boolean | null | undefined>;
  signal?: AbortSignal;
  /** Leave a 401 to the caller instead of sending the person to sign-in (sign-in, me). */
  allowUnauthenticated?: boolean;
}

let onUnauthenticated: () => void = () => {
  const here = window.location.pathname + window.location.search;
  if (!window.location.pathname.startsWith('/sign-in')) {
    window.location.assign(`/sign-in?next=${encodeURIComponent(here)}`);
  }
};

/** The router replaces the default full-page redirect with a client-side navigation. */
export function setUnauthenticatedHandler(handler: () => void): void {
  onUnauthenticated = handler;
}

function buildUrl(path: string, query: RequestOptions['query']): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

async function request<T>(method: Method, path: string, options: RequestOptions = {}): Promise<T> {
  // CSRF (docs/ARCHITECTURE.md, "Server conventions"): the server checks the Origin
  // header, which the browser itself adds to every same-origin mutating fetch, on top
  // of the SameSite=Lax cookie; no token has to be sent.
  const headers: Record<string, string> = { Accept: 'application/json' };
  let body: string | undefined;
  if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(options.body);
  }

  let response: Response;
  try {
    response = await fetch(buildUrl(path, options.query), {
      method,
      headers,
      body,
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError(
      0,
      'network_error',
      'Quarry could not reach the server. Check your connection and try again.',
    );
  }

  if (response.status === 204) return undefined as T;
  const text = await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }

  if (!response.ok) {
    const parsed = apiErrorSchema.safeParse(data);
    const error = parsed.success
      ? new ApiError(
          response.status,
          parsed.data.error.code,
          parsed.data.error.message,
          parsed.data.error.field,
        )
      : new ApiError(
          response.status,
          'internal_error',
          `The server answered ${response.status} ${response.statusText}.`,
        );
    if (response.status === 401 && !options.allowUnauthenticated) onUnauthenticated();
    throw error;
  }
  return data as T;
}

export const api = {
  get: <T>(path: string, options?: RequestOptions) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('PATCH', path, { ...options, body }),
  delete: <T>(path: string, body?: unknown, options?: RequestOptions) =>
    request<T>('DELETE', path, { ...options, body }),
};
