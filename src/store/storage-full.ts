/** The tablet's storage is full: nothing was written, and the nurse's typing is still on screen. */
export class StorageFullError extends Error {
  constructor(cause: unknown) {
    super("The tablet's storage is full, so this was NOT saved. Your typing is kept on screen. Free space on the tablet or call IT, then save again.", { cause });
    this.name = 'StorageFullError';
  }
}

/** True for a quota error, also when IndexedDB or Dexie wraps it (an AbortError whose inner error is the quota). */
export function isQuotaError(error: unknown, depth = 0): boolean {
  if (depth > 5 || error === null || typeof error !== 'object') return false;
  const e = error as { name?: unknown; code?: unknown; inner?: unknown; cause?: unknown };
  if (e.name === 'QuotaExceededError') return true;
  // Legacy DOMException code for QUOTA_EXCEEDED_ERR.
  if (e.code === 22 && e.name !== 'AbortError') return true;
  return isQuotaError(e.inner, depth + 1) || isQuotaError(e.cause, depth + 1);
}

/** Runs a write and turns any quota failure into a StorageFullError the screen can explain. */
export async function withStorageFullCheck<T>(write: () => Promise<T>): Promise<T> {
  try {
    return await write();
  } catch (error) {
    if (isQuotaError(error)) throw new StorageFullError(error);
    throw error;
  }
}
