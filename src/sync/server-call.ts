import type { z } from 'zod';
import type { FieldError } from '../core/field-error.ts';
import { SyncError } from './sync-error.ts';

/** The slice of `fetch` the sync engine uses; the browser's fetch fits, and so does a test's fake server. */
export type SyncFetch = (
  url: string,
  init: { method: string; headers: Record<string, string>; body?: string; signal?: AbortSignal },
) => Promise<{ status: number; json(): Promise<unknown> }>;

/** How to reach the unit server, with the timers injected so tests control time. */
export interface ServerConnection {
  fetch: SyncFetch;
  /** Origin of the unit server, e.g. "https://rhythm.unit.example"; "" for the page's own origin. */
  baseUrl: string;
  setTimeout: (run: () => void, delayMs: number) => unknown;
  clearTimeout: (handle: unknown) => void;
  /** A call that takes longer than this is abandoned and counted as a timeout. */
  requestTimeoutMs: number;
}

/** The tokens an authenticated call carries. */
export interface CallCredentials {
  sessionToken: string;
  deviceToken: string | null;
}

/** Default time allowed for one call: long enough for a 200-change push on a slow ward network. */
export const defaultRequestTimeoutMs = 30_000;

function statusError(status: number, body: unknown): SyncError {
  const serverErrors = (body as { errors?: unknown } | null)?.errors;
  const errors: FieldError[] = Array.isArray(serverErrors)
    ? serverErrors.filter((e): e is FieldError => typeof e?.field === 'string' && typeof e?.message === 'string')
    : [];
  const serverMessage = (body as { error?: unknown; message?: unknown } | null)?.error ?? (body as { message?: unknown } | null)?.message;
  const said = typeof serverMessage === 'string' ? ` (${serverMessage.slice(0, 200)})` : '';
  const serverCode = (body as { code?: unknown } | null)?.code;
  const code = typeof serverCode === 'string' && /^[a-z-]{1,40}$/.test(serverCode) ? serverCode : undefined;
  if (status === 401) return new SyncError('signed-out', 'The unit server asks you to sign in again; nothing was lost and everything waits to send.', { status });
  if (status === 403) return new SyncError('not-allowed', `The unit server refused this tablet or account${said}. Ask the unit admin to check the tablet's enrolment.`, { status, ...(code ? { code } : {}) });
  if (status === 429) return new SyncError('rate-limited', 'The unit server asked the tablet to wait; it will try again.', { status });
  if (status >= 500) return new SyncError('server', `The unit server had a problem (status ${status}); the tablet will try again.`, { status });
  const detail = errors.length > 0 ? `: ${errors.map((e) => e.message).join('; ')}` : said;
  return new SyncError('refused', `The unit server refused the request (status ${status})${detail}`, { status, errors, ...(code ? { code } : {}) });
}

/**
 * One JSON call to the unit server. The answer is checked against its schema before anything sees
 * it; any failure (no network, time-out, status, malformed answer) comes back as a SyncError.
 */
export async function callServer<T>(
  connection: ServerConnection,
  request: { method: 'GET' | 'POST'; path: string; body?: unknown; credentials?: CallCredentials | null; schema: z.ZodType<T>; emptyStatus?: number },
): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (request.body !== undefined) headers['content-type'] = 'application/json';
  if (request.credentials) {
    headers.authorization = `Bearer ${request.credentials.sessionToken}`;
    if (request.credentials.deviceToken) headers['x-device-token'] = request.credentials.deviceToken;
  }
  const controller = typeof AbortController === 'function' ? new AbortController() : null;
  let timedOut = false;
  const timer = connection.setTimeout(() => {
    timedOut = true;
    controller?.abort();
  }, connection.requestTimeoutMs);
  let response: { status: number; json(): Promise<unknown> };
  try {
    const init: Parameters<SyncFetch>[1] = { method: request.method, headers };
    if (request.body !== undefined) init.body = JSON.stringify(request.body);
    if (controller) init.signal = controller.signal;
    response = await connection.fetch(`${connection.baseUrl.replace(/\/+$/, '')}${request.path}`, init);
  } catch (cause) {
    if (timedOut) throw new SyncError('timeout', 'The unit server did not answer in time; the tablet will try again.', { cause });
    throw new SyncError('unreachable', 'The unit server cannot be reached (offline, or the server is down); the tablet will try again.', { cause });
  } finally {
    connection.clearTimeout(timer);
  }
  if (request.emptyStatus !== undefined && response.status === request.emptyStatus) return request.schema.parse(undefined);
  let body: unknown;
  try {
    body = await response.json();
  } catch (cause) {
    if (response.status < 200 || response.status >= 300) throw statusError(response.status, null);
    throw new SyncError('malformed', `The unit server's answer (status ${response.status}) was not readable; nothing in it was applied.`, { status: response.status, cause });
  }
  if (response.status < 200 || response.status >= 300) throw statusError(response.status, body);
  const parsed = request.schema.safeParse(body);
  if (!parsed.success) {
    const where = parsed.error.issues.slice(0, 3).map((i) => i.path.join('.') || '(answer)').join(', ');
    throw new SyncError('malformed', `The unit server's answer did not match the sync contract (at ${where}); nothing in it was applied.`, { status: response.status });
  }
  return parsed.data;
}
