import { liveQuery } from 'dexie';
import type { RhythmDb } from '../store/db.ts';
import { adoptUnit } from './adopt-unit.ts';
import type { BackoffPolicy } from './backoff.ts';
import { backoffDelayMs, defaultBackoffPolicy } from './backoff.ts';
import type { PullSummary } from './pull-changes.ts';
import { pullChanges } from './pull-changes.ts';
import type { PushSummary } from './push-outbox.ts';
import { pushOutbox } from './push-outbox.ts';
import type { ServerConnection, SyncFetch } from './server-call.ts';
import { defaultRequestTimeoutMs } from './server-call.ts';
import { credentialsOf, currentSession, dropSession } from './server-session.ts';
import type { SyncErrorKind } from './sync-error.ts';
import { SyncError, isServerRestored } from './sync-error.ts';
import { beginRecovery, currentRecovery, finishRecoveryIfSent, pullAndSortAfterRestore } from './recover-after-restore.ts';
import { refusedCounts } from './refused-changes.ts';
import type { RestoreRecovery } from './sync-settings.ts';
import { lastSyncedKey, readSyncSetting, restoreRecoveryKey, writeSyncSetting } from './sync-settings.ts';

/** Everything the status line needs, always current. */
export interface SyncState {
  /** When a push and pull last both finished, by this tablet's clock. */
  lastSyncedAtMs: number | null;
  /** Outbox changes waiting to send. */
  pendingCount: number;
  /** Changes the server refused that no nurse has marked as seen; they stay on the tablet with the reason. */
  rejectedCount: number;
  /** Of those, signed reads. */
  rejectedReadCount: number;
  /**
   * Refused changes already marked as seen (still kept, listed under "seen"). This and `restore`
   * came later than the rest and may be absent from a state built elsewhere (a screen's test
   * double); absent reads as none.
   */
  seenRejectedCount?: number | undefined;
  /** A recovery after the unit server was restored from a backup, while under way and for a while after. */
  restore?: RestoreNotice | null | undefined;
  lastError: string | null;
  lastErrorKind: SyncErrorKind | null;
  running: boolean;
  signedIn: boolean;
  /** The browser's own idea of the network; false means certainly offline. */
  online: boolean;
  /** When the next automatic try is due, if one is planned. */
  nextRetryAtMs: number | null;
  failuresInRow: number;
}

/** What the sync line says about a unit server restore. */
export interface RestoreNotice {
  phase: RestoreRecovery['phase'];
  detectedAtMs: number;
  resentCount: number;
  doneAtMs: number | null;
}

/** What one run did: both counts on success, or the error that stopped it. */
export type SyncRunResult = { ok: true; pushed: PushSummary; pulled: PullSummary } | { ok: false; error: SyncError };

/** Where the engine gets its world from; everything with a side effect outside the database is injected. */
export interface SyncEngineOptions {
  db: RhythmDb;
  fetch: SyncFetch;
  baseUrl: string;
  now: () => number;
  random: () => number;
  setTimeout: (run: () => void, delayMs: number) => unknown;
  clearTimeout?: (handle: unknown) => void;
  /** Time between runs while everything works (new changes are sent sooner, see `soonDelayMs`). */
  intervalMs?: number;
  /** Wait after a new outbox change before sending, so a burst of saves goes in one push. */
  soonDelayMs?: number;
  backoff?: BackoffPolicy;
  requestTimeoutMs?: number;
  /** Source of the `online` and `offline` events (the window); null for none. */
  events?: Pick<EventTarget, 'addEventListener' | 'removeEventListener'> | null;
  isOnline?: () => boolean;
  /** Watches the outbox with a live query, so counts update and new changes are sent on their own. */
  watchOutbox?: boolean;
}

/** The tablet's sync engine. */
export interface SyncEngine {
  /** Pushes then pulls now; calls while a run is under way share that run. */
  syncNow(): Promise<SyncRunResult>;
  /** Starts automatic syncing: on the interval, after failures with backoff, and when the network returns. */
  start(): void;
  /** Stops every timer and listener; a run under way finishes. */
  stop(): void;
  getState(): SyncState;
  subscribe(listener: (state: SyncState) => void): () => void;
  /** Re-reads counts and the session from the database (after sign-in, or a change the live query cannot see). */
  refresh(): Promise<void>;
}

function noticeOf(recovery: RestoreRecovery): RestoreNotice {
  return { phase: recovery.phase, detectedAtMs: recovery.detectedAtMs, resentCount: recovery.resentCount, doneAtMs: recovery.doneAtMs };
}

function addPushSummaries(a: PushSummary, b: PushSummary): PushSummary {
  return { batches: a.batches + b.batches, accepted: a.accepted + b.accepted, rejected: a.rejected + b.rejected, deferred: b.deferred, deferredReason: b.deferredReason ?? a.deferredReason };
}

/** Default time between runs while all is well. */
export const defaultSyncIntervalMs = 60_000;
/** Default wait after a new change before sending it. */
export const defaultSoonDelayMs = 1_500;

const offlineError = () => new SyncError('unreachable', 'This tablet is offline. Reads are safe on the tablet and will send when the network returns.');

/** Creates the engine; nothing happens until `start()` or `syncNow()`. */
export function createSyncEngine(options: SyncEngineOptions): SyncEngine {
  const { db, now, random } = options;
  const clearTimer = options.clearTimeout ?? ((handle: unknown) => clearTimeout(handle as ReturnType<typeof setTimeout>));
  const connection: ServerConnection = {
    fetch: options.fetch,
    baseUrl: options.baseUrl,
    setTimeout: options.setTimeout,
    clearTimeout: clearTimer,
    requestTimeoutMs: options.requestTimeoutMs ?? defaultRequestTimeoutMs,
  };
  const intervalMs = options.intervalMs ?? defaultSyncIntervalMs;
  const soonDelayMs = options.soonDelayMs ?? defaultSoonDelayMs;
  const backoff = options.backoff ?? defaultBackoffPolicy;
  const isOnline = options.isOnline ?? (() => globalThis.navigator?.onLine ?? true);
  const events = options.events === undefined ? (typeof window === 'undefined' ? null : window) : options.events;

  let state: SyncState = {
    lastSyncedAtMs: null,
    pendingCount: 0,
    rejectedCount: 0,
    rejectedReadCount: 0,
    seenRejectedCount: 0,
    restore: null,
    lastError: null,
    lastErrorKind: null,
    running: false,
    signedIn: false,
    online: isOnline(),
    nextRetryAtMs: null,
    failuresInRow: 0,
  };
  const listeners = new Set<(s: SyncState) => void>();
  let inFlight: Promise<SyncRunResult> | null = null;
  let timer: unknown = null;
  let started = false;
  let outboxWatch: { unsubscribe(): void } | null = null;

  const set = (patch: Partial<SyncState>) => {
    state = { ...state, ...patch };
    for (const listener of listeners) listener(state);
  };

  const cancelTimer = () => {
    if (timer !== null) clearTimer(timer);
    timer = null;
  };

  const schedule = (delayMs: number) => {
    if (!started) return;
    cancelTimer();
    set({ nextRetryAtMs: now() + delayMs });
    timer = options.setTimeout(() => {
      timer = null;
      void syncNow();
    }, delayMs);
  };

  const counts = async () => {
    const waiting = await db.outbox.where('status').anyOf('pending', 'sending').count();
    const refused = await refusedCounts(db);
    const recovery = await readSyncSetting<RestoreRecovery>(db, restoreRecoveryKey);
    return { pendingCount: waiting, rejectedCount: refused.unseen, rejectedReadCount: refused.unseenReads, seenRejectedCount: refused.seen, restore: recovery ? noticeOf(recovery) : null };
  };

  const refresh = async () => {
    const [found, session, lastSyncedAtMs] = await Promise.all([counts(), currentSession(db), readSyncSetting<number>(db, lastSyncedKey)]);
    set({ ...found, signedIn: session !== null, lastSyncedAtMs: lastSyncedAtMs ?? state.lastSyncedAtMs, online: isOnline() });
  };

  /** One push and pull; says when the next run is due (null: only when someone signs in again). */
  const run = async (): Promise<{ result: SyncRunResult; nextDelayMs: number | null }> => {
    set({ running: true, nextRetryAtMs: null });
    let outcome: { result: SyncRunResult; nextDelayMs: number | null };
    try {
      const credentials = await credentialsOf(db);
      const session = await currentSession(db);
      if (!credentials || !session) throw new SyncError('signed-out', 'Sign in to the unit server to send reads; they are safe on the tablet until then.');
      if (!isOnline()) throw offlineError();
      const unitId = session.user.unitId;
      // A recovery interrupted before it knew what the server lost finishes that first, so nothing is sent twice needlessly.
      const interrupted = await currentRecovery(db, unitId);
      if (interrupted?.phase === 'pulling') await pullAndSortAfterRestore(db, connection, credentials, interrupted);
      let pushed = await pushOutbox(db, connection, credentials, undefined, session.user.role);
      let pulled: PullSummary;
      try {
        pulled = await pullChanges(db, connection, credentials, unitId);
      } catch (error) {
        if (!isServerRestored(error)) throw error;
        // The unit server went back to a backup: read its whole log again, re-send what it lost, then pull what that made.
        const begun = await beginRecovery(db, unitId, now());
        set({ restore: noticeOf(begun) });
        const sorted = await pullAndSortAfterRestore(db, connection, credentials, begun);
        set({ restore: noticeOf(sorted.recovery) });
        pushed = addPushSummaries(pushed, await pushOutbox(db, connection, credentials, undefined, session.user.role));
        pulled = await pullChanges(db, connection, credentials, unitId);
      }
      const recovery = await currentRecovery(db, unitId);
      if (recovery) await finishRecoveryIfSent(db, recovery, now());
      await adoptUnit(db, session.user.unitId);
      const syncedAtMs = now();
      await writeSyncSetting(db, lastSyncedKey, syncedAtMs);
      if (pushed.deferred > 0) {
        // Some changes wait for others to reach the server first: sent again with backoff, so a
        // change that can never pass (its author never signs in here) does not keep the radio busy.
        const failuresInRow = state.failuresInRow + 1;
        const what = pushed.deferred === 1 ? '1 change waits' : `${pushed.deferred} changes wait`;
        set({ lastSyncedAtMs: syncedAtMs, lastError: `${what}: ${pushed.deferredReason ?? 'the unit server needs earlier changes first'}`, lastErrorKind: 'not-yet', failuresInRow, signedIn: true });
        outcome = { result: { ok: true, pushed, pulled }, nextDelayMs: backoffDelayMs(failuresInRow, random, backoff) };
      } else {
        set({ lastSyncedAtMs: syncedAtMs, lastError: null, lastErrorKind: null, failuresInRow: 0, signedIn: true });
        outcome = { result: { ok: true, pushed, pulled }, nextDelayMs: intervalMs };
      }
    } catch (thrown) {
      const error = thrown instanceof SyncError ? thrown : new SyncError('server', 'Sync stopped on an unexpected problem on the tablet; it will try again. Nothing was lost.', { cause: thrown });
      if (error.kind === 'signed-out') {
        // The session has ended: stop trying (every try would fail the same way) and keep
        // everything waiting until a nurse signs in again.
        await dropSession(db).catch(() => undefined);
        set({ signedIn: false, lastError: error.message, lastErrorKind: error.kind });
        outcome = { result: { ok: false, error }, nextDelayMs: null };
      } else {
        const failuresInRow = state.failuresInRow + 1;
        set({ lastError: error.message, lastErrorKind: error.kind, failuresInRow });
        // A refusal of this tablet or account (403) will not pass by itself: it waits for a sign-in.
        outcome = { result: { ok: false, error }, nextDelayMs: error.retryable ? backoffDelayMs(failuresInRow, random, backoff) : null };
      }
    }
    await refresh().catch(() => undefined);
    // Changes saved while a successful run was sending go out soon rather than on the interval.
    if (outcome.result.ok && state.lastError === null && state.pendingCount > 0) outcome.nextDelayMs = soonDelayMs;
    set({ running: false });
    return outcome;
  };

  const syncNow = (): Promise<SyncRunResult> => {
    if (!inFlight) {
      inFlight = run().then(({ result, nextDelayMs }) => {
        // The next run is planned only once this one is over, so its timer can never fire into
        // (and be absorbed by) the run that planned it.
        inFlight = null;
        if (nextDelayMs === null) cancelTimer();
        else schedule(nextDelayMs);
        return result;
      });
    }
    return inFlight;
  };

  const onOnline = () => {
    set({ online: true });
    // The network is back: whatever backoff was planned, try now.
    if (state.signedIn) void syncNow();
  };
  const onOffline = () => set({ online: false });

  const start = () => {
    if (started) return;
    started = true;
    events?.addEventListener('online', onOnline);
    events?.addEventListener('offline', onOffline);
    if (options.watchOutbox !== false) {
      outboxWatch = liveQuery(counts).subscribe({
        next: (found) => {
          const grew = found.pendingCount > state.pendingCount;
          set(found);
          // A new change goes out soon, unless the engine is backing off after failures.
          if (grew && started && state.signedIn && state.failuresInRow === 0 && !state.running) schedule(soonDelayMs);
        },
        error: () => undefined,
      });
    }
    void refresh()
      .catch(() => undefined)
      .then(() => {
        if (started && state.signedIn) void syncNow();
      });
  };

  const stop = () => {
    started = false;
    cancelTimer();
    set({ nextRetryAtMs: null });
    events?.removeEventListener('online', onOnline);
    events?.removeEventListener('offline', onOffline);
    outboxWatch?.unsubscribe();
    outboxWatch = null;
  };

  return {
    syncNow,
    start,
    stop,
    getState: () => state,
    subscribe(listener) {
      listeners.add(listener);
      listener(state);
      return () => listeners.delete(listener);
    },
    refresh,
  };
}
