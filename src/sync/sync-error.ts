import type { FieldError } from '../core/field-error.ts';

/** Why a call to the unit server failed, in categories the engine acts on. */
export type SyncErrorKind = 'unreachable' | 'timeout' | 'signed-out' | 'not-allowed' | 'rate-limited' | 'server' | 'refused' | 'malformed' | 'not-yet';

const retryableKinds: ReadonlySet<SyncErrorKind> = new Set(['unreachable', 'timeout', 'rate-limited', 'server', 'malformed', 'refused', 'not-yet']);

/**
 * A failed call to the unit server. Thrown deep in the sync steps and turned into the status line
 * once, in the engine; it never carries patient data, only the status and the server's own words.
 */
export class SyncError extends Error {
  readonly kind: SyncErrorKind;
  readonly status: number | null;
  readonly errors: FieldError[];
  /** The server's machine-readable code (e.g. "cursor-ahead"), when it gave one. */
  readonly code: string | null;
  constructor(kind: SyncErrorKind, message: string, options: { status?: number; errors?: FieldError[]; code?: string; cause?: unknown } = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'SyncError';
    this.kind = kind;
    this.status = options.status ?? null;
    this.errors = options.errors ?? [];
    this.code = options.code ?? null;
  }

  /** Whether trying again later may succeed without anyone doing anything. */
  get retryable(): boolean {
    return retryableKinds.has(this.kind);
  }
}

/** The code the unit server gives a pull whose cursor lies beyond its log: it was restored from a backup. */
export const serverRestoredCode = 'cursor-ahead';

/** The error a pull ends with when the unit server's log no longer holds what this tablet has already pulled. */
export function serverRestoredError(): SyncError {
  return new SyncError('refused', 'The unit server was restored from an earlier backup: this tablet pulls everything again and re-sends what the server lost.', { status: 409, code: serverRestoredCode });
}

/** Whether a failed call means the unit server went back to an earlier backup. */
export function isServerRestored(error: unknown): boolean {
  return error instanceof SyncError && error.status === 409 && error.code === serverRestoredCode;
}
