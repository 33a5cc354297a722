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
  constructor(kind: SyncErrorKind, message: string, options: { status?: number; errors?: FieldError[]; cause?: unknown } = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'SyncError';
    this.kind = kind;
    this.status = options.status ?? null;
    this.errors = options.errors ?? [];
  }

  /** Whether trying again later may succeed without anyone doing anything. */
  get retryable(): boolean {
    return retryableKinds.has(this.kind);
  }
}
