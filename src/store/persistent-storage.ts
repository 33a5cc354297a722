/** Whether the browser promised to keep this tablet's data under storage pressure. */
export type PersistenceState = 'granted' | 'not-granted' | 'unsupported';

/** Asks the browser to keep the database even when the disk fills (it may refuse until the app is installed). */
export async function requestPersistentStorage(storage: StorageManager | undefined = globalThis.navigator?.storage): Promise<PersistenceState> {
  if (!storage || typeof storage.persist !== 'function') return 'unsupported';
  try {
    if (typeof storage.persisted === 'function' && (await storage.persisted())) return 'granted';
    return (await storage.persist()) ? 'granted' : 'not-granted';
  } catch {
    return 'not-granted';
  }
}
