// The one API client of the app: JSON in and out, the session cookie sent along, errors turned into
// ApiError with the server's code, message and field details.
import type { ApiErrorBody } from '@shared/schemas/errors';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
  /** Field messages of a validation error, keyed by field path. */
  fieldErrors(): Record<string, string> {
    if (!Array.isArray(this.details)) return {};
    return Object.fromEntries(this.details.map((d: { path: string; message: string }) => [d.path, d.message]));
  }
}

type Query = Record<string, string | number | boolean | undefined | null>;
type Options = { method?: string; body?: unknown; query?: Query; signal?: AbortSignal };

let onUnauthorized: () => void = () => {};
/** Called when a request comes back 401: the app returns to the sign-in page. */
export function setUnauthorizedHandler(handler: () => void) {
  onUnauthorized = handler;
}

export function apiUrl(path: string, query?: Query) {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value));
  }
  const search = params.toString();
  return `/api${path}${search ? `?${search}` : ''}`;
}

export async function api<T>(path: string, options: Options = {}): Promise<T> {
  const isForm = options.body instanceof FormData;
  const response = await fetch(apiUrl(path, options.query), {
    method: options.method ?? (options.body ? 'POST' : 'GET'),
    credentials: 'same-origin',
    headers: options.body && !isForm ? { 'Content-Type': 'application/json' } : undefined,
    body: isForm ? (options.body as FormData) : options.body ? JSON.stringify(options.body) : undefined,
    signal: options.signal,
  });
  if (response.status === 204) return undefined as T;
  const payload = await response.json().catch(() => null);
  if (!response.ok) {
    const error = (payload as ApiErrorBody | null)?.error;
    if (response.status === 401 && !path.startsWith('/auth/')) onUnauthorized();
    throw new ApiError(response.status, error?.code ?? 'http', error?.message ?? `Request failed (${response.status})`, error?.details);
  }
  return payload as T;
}
