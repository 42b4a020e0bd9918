import { z } from 'zod';

/** Error shape every API route answers with on a 4xx (see the team brief). */
const ApiErrorBodySchema = z.object({
  error: z.object({
    message: z.string(),
    fields: z.record(z.string(), z.unknown()).optional(),
  }),
});

/** A failed API call, with the server's own message and any per-field messages. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields: Record<string, string> = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

const CSRF_HEADER = 'X-CSRF-Token';
const MUTATING_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const HTTP_FORBIDDEN = 403;

let csrfToken: string | null = null;

/** Forget the CSRF token; the session changes at sign-in and sign-out, and so does the token. */
export function resetCsrfToken(): void {
  csrfToken = null;
}

async function fetchCsrfToken(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  if (!res.ok) throw new ApiError(res.status, 'Could not get a security token from the server.');
  const body = z.object({ csrfToken: z.string() }).parse(await res.json());
  csrfToken = body.csrfToken;
  return csrfToken;
}

function fieldMessages(fields: Record<string, unknown> | undefined): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, value] of Object.entries(fields ?? {})) {
    out[name] = Array.isArray(value) ? value.map(String).join(' ') : String(value);
  }
  return out;
}

async function toApiError(res: Response): Promise<ApiError> {
  const fallback = res.status === 429 ? 'Too many attempts. Wait a minute and try again.' : `Request failed (${res.status}).`;
  try {
    const parsed = ApiErrorBodySchema.safeParse(await res.json());
    if (parsed.success) return new ApiError(res.status, parsed.data.error.message, fieldMessages(parsed.data.error.fields));
  } catch {
    // Not JSON (a proxy page, an empty body): fall back to the status.
  }
  return new ApiError(res.status, fallback);
}

export interface ApiRequest<T> {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** JSON body, or a FormData for multipart uploads (the browser sets its boundary). */
  body?: unknown;
  /** Validates the answer; the client never trusts a shape it has not checked. */
  schema?: z.ZodType<T>;
  signal?: AbortSignal;
}

/** The session's CSRF token for a request the api() helper cannot make (an upload with progress). */
export async function csrfTokenForUpload(): Promise<string> {
  return csrfToken ?? fetchCsrfToken();
}

async function send(path: string, method: string, body: unknown, signal?: AbortSignal): Promise<Response> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const multipart = typeof FormData !== 'undefined' && body instanceof FormData;
  if (body !== undefined && !multipart) headers['Content-Type'] = 'application/json';
  if (MUTATING_METHODS.has(method)) headers[CSRF_HEADER] = csrfToken ?? (await fetchCsrfToken());
  return fetch(path, {
    method,
    headers,
    credentials: 'same-origin',
    body: body === undefined ? undefined : multipart ? (body as FormData) : JSON.stringify(body),
    signal,
  });
}

/** Calls the Kneepoint API: adds the CSRF header to state-changing calls and validates the answer. */
export async function api<T = unknown>(path: string, request: ApiRequest<T> = {}): Promise<T> {
  const method = request.method ?? 'GET';
  let res = await send(path, method, request.body, request.signal);
  // A stale token (the session rotated) gets one fresh try before we give up.
  if (res.status === HTTP_FORBIDDEN && MUTATING_METHODS.has(method)) {
    resetCsrfToken();
    res = await send(path, method, request.body, request.signal);
  }
  if (!res.ok) throw await toApiError(res);
  const text = await res.text();
  const data: unknown = text ? JSON.parse(text) : undefined;
  return request.schema ? request.schema.parse(data) : (data as T);
}
