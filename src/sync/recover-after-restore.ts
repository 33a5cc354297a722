import { changeSchema } from '../core/records.ts';
import type { OutboxRow, RhythmDb } from '../store/db.ts';
import { isPutKind, syncWriteTables } from './apply-server-changes.ts';
import { pullChanges } from './pull-changes.ts';
import type { PullSummary } from './pull-changes.ts';
import { settleRecord, setRecordStatus } from './push-outbox.ts';
import type { CallCredentials, ServerConnection } from './server-call.ts';
import type { PulledChange } from './sync-protocol.ts';
import { pullPageLimit } from './sync-protocol.ts';
import type { RestoreRecovery } from './sync-settings.ts';
import { cursorKey, readSyncSetting, restoreRecoveryKey, serverVersionKeyPrefix, writeSyncSetting } from './sync-settings.ts';

/*
 * After a restore the unit server has forgotten everything since its backup, while this tablet
 * still holds it. The tablet reads the whole log again, then sends again exactly the changes it had
 * sent whose records the log no longer holds, in their original order. Re-sending is safe: a read
 * or amendment already on the server is recognised by its id, and only versions of units, beds,
 * stays and handovers that the log lacks are sent, so a later edit from another tablet that the
 * server kept is never overwritten by an older one from here.
 */

/** The reason shown beside a record that is being sent again. */
export const resendReason = 'The unit server was restored from a backup and no longer held this; the tablet is sending it again.';

function unitIdOf(row: OutboxRow): string {
  return row.change.kind === 'unit.put' ? row.change.record.id : row.change.record.unitId;
}

/** The recovery under way for this unit, or null. */
export async function currentRecovery(db: RhythmDb, unitId: string): Promise<RestoreRecovery | null> {
  const found = await readSyncSetting<RestoreRecovery>(db, restoreRecoveryKey);
  return found && found.unitId === unitId ? found : null;
}

/**
 * Starts a recovery: every accepted outbox row goes back to waiting (so a pulled older version of
 * a record is held back rather than shown over the tablet's own edit), the cursor goes back to the
 * start, and the server versions the tablet knew are forgotten (their numbers belong to the lost
 * log). One transaction, so a crash leaves either no recovery or a whole one to resume.
 */
export async function beginRecovery(db: RhythmDb, unitId: string, nowMs: number): Promise<RestoreRecovery> {
  return db.transaction('rw', [...syncWriteTables], async () => {
    const earlier = await currentRecovery(db, unitId);
    // Only this unit's rows: work sent to another unit's server before the tablet changed wards is not this server's to hold.
    const accepted = (await db.outbox.where('status').equals('accepted').toArray()).filter((row) => unitIdOf(row) === unitId);
    const requeued = accepted.map((row) => row.seq!);
    for (const seq of requeued) await db.outbox.update(seq, { status: 'pending' });
    await db.settings.where('key').startsWith(serverVersionKeyPrefix).delete();
    await writeSyncSetting(db, cursorKey, { unitId, cursor: 0 });
    // A second restore during a recovery keeps the rows the first one had put back.
    const stillWaiting = earlier && earlier.phase !== 'done' ? earlier.requeuedSeqs : [];
    const recovery: RestoreRecovery = {
      unitId,
      detectedAtMs: nowMs,
      phase: 'pulling',
      requeuedSeqs: [...new Set([...stillWaiting, ...requeued])].sort((a, b) => a - b),
      resentCount: 0,
      doneAtMs: null,
    };
    await writeSyncSetting(db, restoreRecoveryKey, recovery);
    return recovery;
  });
}

/** A record's JSON with keys in a fixed order and undefined values left out, for comparing versions. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

/** What the server's log holds of the records a set of outbox rows touch: the ids of reads and amendments, every version of the rest. */
export class HeldByServer {
  private readonly wanted: Set<string>;
  private readonly seen = new Map<string, Set<string>>();

  constructor(rows: readonly OutboxRow[]) {
    this.wanted = new Set(rows.map((r) => `${r.kind}:${r.change.record.id}`));
  }

  /** Notes a page of pulled changes. */
  readonly observe = (changes: readonly PulledChange[]): void => {
    for (const change of changes) {
      const key = `${change.kind}:${change.record.id}`;
      if (!this.wanted.has(key)) continue;
      let versions = this.seen.get(key);
      if (!versions) this.seen.set(key, (versions = new Set()));
      // Reads and amendments are immutable under their id: holding the id is holding the record.
      if (isPutKind(change.kind)) versions.add(canonicalJson(change.record));
    }
  };

  /** Whether the log holds this row's record: the id for reads and amendments, the very version for the rest. */
  holds(row: OutboxRow): boolean {
    const versions = this.seen.get(`${row.kind}:${row.change.record.id}`);
    if (!versions) return false;
    if (!isPutKind(row.kind)) return true;
    // The tablet's copy goes through the same schema as a pulled record, so defaults match.
    const parsed = changeSchema.safeParse(row.change);
    return versions.has(canonicalJson(parsed.success ? parsed.data.record : row.change.record));
  }
}

/**
 * Reads the whole log again from the start and sorts the rows put back to waiting: those whose
 * record the server still holds are accepted again (their records show the server's latest
 * version), the rest stay waiting with a reason and go out with the next push. Safe to run again
 * after an interruption: it always starts from the beginning.
 */
export async function pullAndSortAfterRestore(
  db: RhythmDb,
  connection: ServerConnection,
  credentials: CallCredentials,
  recovery: RestoreRecovery,
  limit: number = pullPageLimit,
): Promise<{ recovery: RestoreRecovery; pulled: PullSummary }> {
  await db.transaction('rw', db.settings, async () => {
    await db.settings.where('key').startsWith(serverVersionKeyPrefix).delete();
    await writeSyncSetting(db, cursorKey, { unitId: recovery.unitId, cursor: 0 });
  });
  const rows = (await db.outbox.bulkGet(recovery.requeuedSeqs)).filter((r): r is OutboxRow => r !== undefined);
  const held = new HeldByServer(rows);
  const pulled = await pullChanges(db, connection, credentials, recovery.unitId, limit, held.observe);
  const sorted = await db.transaction('rw', [...syncWriteTables], async () => {
    let resentCount = 0;
    for (const row of rows) {
      const current = await db.outbox.get(row.seq!);
      // Only rows still waiting from the recovery are sorted; anything answered meanwhile keeps its answer.
      if (current?.status !== 'pending') continue;
      if (held.holds(current)) {
        await db.outbox.update(current.seq!, { status: 'accepted' });
        await setRecordStatus(db, current.change, { status: 'accepted' });
        if (isPutKind(current.kind)) await settleRecord(db, current.kind, current.change.record.id, false);
      } else {
        resentCount += 1;
        await setRecordStatus(db, current.change, { status: 'pending', reason: resendReason });
      }
    }
    const next: RestoreRecovery = { ...recovery, phase: 'sending', resentCount };
    await writeSyncSetting(db, restoreRecoveryKey, next);
    return next;
  });
  return { recovery: sorted, pulled };
}

/** Marks the recovery done once none of the rows it put back waits any more; returns it as it now stands. */
export async function finishRecoveryIfSent(db: RhythmDb, recovery: RestoreRecovery, nowMs: number): Promise<RestoreRecovery> {
  if (recovery.phase !== 'sending') return recovery;
  return db.transaction('rw', [db.outbox, db.settings], async () => {
    const rows = await db.outbox.bulkGet(recovery.requeuedSeqs);
    if (rows.some((r) => r?.status === 'pending' || r?.status === 'sending')) return recovery;
    const done: RestoreRecovery = { ...recovery, phase: 'done', doneAtMs: nowMs };
    await writeSyncSetting(db, restoreRecoveryKey, done);
    return done;
  });
}
