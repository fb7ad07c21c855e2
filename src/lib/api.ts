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
  /** True when the server refused the session itself (missing, expired or ended: code `unauthorized`
   * or `session_…`). Any other 401, such as a refused signature password, answers that request only. */
  get endsSession(): boolean {
    return this.status === 401 && (this.code === 'unauthorized' || this.code.startsWith('session_'));
  }
}

type Query = Record<string, string | number | boolean | undefined | null>;
type Options = { method?: string; body?: unknown; query?: Query; signal?: AbortSignal; headers?: Record<string, string> };

let onUnauthorized: () => void = () => {};
/** Called when a request comes back with an ended session: the app returns to the sign-in page. */
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
    headers: { ...(options.body && !isForm ? { 'Content-Type': 'application/json' } : {}), ...options.headers },
    body: isForm ? (options.body as FormData) : options.body ? JSON.stringify(options.body) : undefined,
    signal: options.signal,
  });
  if (response.status === 204) return undefined as T;
  const payload = await response.json().catch(() => null);
  if (!response.ok) {
    const body = (payload as ApiErrorBody | null)?.error;
    const error = new ApiError(response.status, body?.code ?? 'http', body?.message ?? `Request failed (${response.status})`, body?.details);
    // The auth routes answer for themselves: /auth/me is the session check, a refused sign-in is no ended session.
    if (error.endsSession && !path.startsWith('/auth/')) onUnauthorized();
    throw error;
  }
  return payload as T;
}
