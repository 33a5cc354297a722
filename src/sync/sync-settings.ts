import type { ChangeKind } from '../core/records.ts';
import type { RhythmDb } from '../store/db.ts';
import type { ServerUser } from './sync-protocol.ts';

/**
 * The sync engine's own rows in the tablet's settings table. Kept apart from the app's settings
 * keys (all start with "sync.") so neither side can overwrite the other's.
 */

/** A server session held by this tablet. */
export interface StoredSession {
  token: string;
  expiresAtMs: number;
  user: ServerUser;
  signedInAtMs: number;
}

/** This tablet's enrolment with the unit server; kept across sign-outs. */
export interface StoredDevice {
  deviceId: string;
  deviceToken: string;
}

/** Where the last pull stopped, for one unit. */
export interface StoredCursor {
  unitId: string;
  cursor: number | string;
  /**
   * The change id of the change numbered `cursor`, as the server sent it. The next pull asks for
   * that change again and checks it is still the same one: a server restored from a backup and
   * then written to again numbers new changes with seqs this tablet has already passed.
   */
  anchorChangeId?: string;
}

/** Where a tablet stands in re-sending its work after the unit server was restored from a backup. */
export interface RestoreRecovery {
  unitId: string;
  detectedAtMs: number;
  /** pulling: reading the whole log again; sending: re-sending what the server lost; done: all back. */
  phase: 'pulling' | 'sending' | 'done';
  /** Outbox rows accepted before the restore, put back to wait while the tablet checks which the server still holds. */
  requeuedSeqs: number[];
  /** How many of them the server no longer held and were sent again. */
  resentCount: number;
  doneAtMs: number | null;
}

/** A refused change the nurse has marked as seen; it stays on the tablet and in the list under "seen". */
export interface RefusedSeen {
  seenAtMs: number;
  seenById: string;
  seenByName: string;
}

/**
 * The latest version of a unit, bed, stay or handover the server has told this tablet about, with
 * its place in the unit's order. It may differ from the table's row while an edit made on this
 * tablet waits to send; it is what the row goes back to if the server refuses that edit.
 */
export interface ServerVersion {
  seq: number;
  record: { id: string };
}

/** Key of the server session (StoredSession). */
export const sessionKey = 'sync.session';
/** Key of this tablet's enrolment (StoredDevice). */
export const deviceKey = 'sync.device';
/** Key of where the last pull stopped (StoredCursor). */
export const cursorKey = 'sync.pullCursor';
/** Key of when a push and pull last both finished, by this tablet's clock. */
export const lastSyncedKey = 'sync.lastSyncedAtMs';
/** Key of the recovery after a unit server restore (RestoreRecovery); absent when there was none. */
export const restoreRecoveryKey = 'sync.restoreRecovery';
/** Key of the refused changes marked as seen, by change id (Record<string, RefusedSeen>). */
export const refusedSeenKey = 'sync.refusedSeen';
/** Key of the ids of server accounts that can unlock this tablet offline. */
export const serverAccountIdsKey = 'sync.serverAccountIds';

/** Common start of every server-version key. */
export const serverVersionKeyPrefix = 'sync.serverVersion.';
/** Key of the latest server version of one record. */
export const serverVersionKey = (kind: ChangeKind, id: string): string => `${serverVersionKeyPrefix}${kind}.${id}`;

/** One of the sync engine's settings, or undefined when never set. */
export async function readSyncSetting<T>(db: RhythmDb, key: string): Promise<T | undefined> {
  const row = await db.settings.get(key);
  return row === undefined ? undefined : (row.value as T);
}

/** Stores one of the sync engine's settings; undefined removes it. */
export async function writeSyncSetting(db: RhythmDb, key: string, value: unknown): Promise<void> {
  if (value === undefined) await db.settings.delete(key);
  else await db.settings.put({ key, value });
}
