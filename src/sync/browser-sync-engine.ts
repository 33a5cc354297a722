import type { RhythmDb } from '../store/db.ts';
import type { ServerConnection } from './server-call.ts';
import { defaultRequestTimeoutMs } from './server-call.ts';
import type { SyncEngine } from './sync-engine.ts';
import { createSyncEngine } from './sync-engine.ts';

/**
 * How the tablet reaches its unit server in the browser. The app is served by that server, so
 * the default base URL is the page's own origin.
 */
export function browserConnection(baseUrl = ''): ServerConnection {
  return {
    fetch: (url, init) => fetch(url, init),
    baseUrl,
    setTimeout: (run, delayMs) => window.setTimeout(run, delayMs),
    clearTimeout: (handle) => window.clearTimeout(handle as number),
    requestTimeoutMs: defaultRequestTimeoutMs,
  };
}

/** The sync engine wired to the browser's clock, randomness, timers, network and window events. */
export function createBrowserSyncEngine(db: RhythmDb, baseUrl = ''): SyncEngine {
  const connection = browserConnection(baseUrl);
  return createSyncEngine({
    db,
    fetch: connection.fetch,
    baseUrl,
    now: () => Date.now(),
    random: () => Math.random(),
    setTimeout: connection.setTimeout,
    clearTimeout: connection.clearTimeout,
  });
}
