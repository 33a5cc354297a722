import type { Change } from '../core/records.ts';
import type { OutboxRow, RhythmDb } from '../store/db.ts';
import type { PutKind } from './apply-server-changes.ts';
import { isPutKind, putRecord, syncWriteTables } from './apply-server-changes.ts';
import type { CallCredentials, ServerConnection } from './server-call.ts';
import { callServer } from './server-call.ts';
import { waitsForRole } from './change-needs-role.ts';
import { SyncError } from './sync-error.ts';
import type { PushResult, ServerUser } from './sync-protocol.ts';
import { maxChangesPerPush, pushResponseSchema } from './sync-protocol.ts';
import type { ServerVersion } from './sync-settings.ts';
import { readSyncSetting, serverVersionKey, writeSyncSetting } from './sync-settings.ts';

/** What one push did. */
export interface PushSummary {
  batches: number;
  accepted: number;
  rejected: number;
  /** Refused for now only (what they need has not reached the server); they stay waiting and go again. */
  deferred: number;
  /** The server's words for the first deferred change, for the status line. */
  deferredReason: string | null;
}

/** The sentence shown beside a refused change: the server's reason, else its field messages, never empty. */
export function rejectReasonOf(result: Pick<PushResult, 'reason' | 'errors'>): string {
  const reason = result.reason?.trim();
  if (reason) return reason;
  const fields = (result.errors ?? []).map((e) => e.message).filter(Boolean);
  if (fields.length > 0) return fields.join('; ');
  return 'The unit server refused this change without giving a reason; ask the unit admin.';
}

/**
 * Checks that an answer covers exactly the batch, in order. A result for another change, or a
 * missing or extra result, means the answer cannot be trusted, so none of it is applied.
 */
export function matchResults(rows: readonly OutboxRow[], results: readonly PushResult[]): PushResult[] {
  if (results.length !== rows.length) {
    throw new SyncError('malformed', `The unit server answered ${results.length} results for ${rows.length} changes; nothing in the answer was applied.`);
  }
  rows.forEach((row, i) => {
    const id = results[i]!.changeId;
    if (id !== null && id !== row.changeId) {
      throw new SyncError('malformed', 'The unit server answered for a change the tablet did not send in that place; nothing in the answer was applied.');
    }
  });
  return [...results];
}

/** Rows waiting to send, oldest first. A row left "sending" by an interrupted push is sent again (the server applies each change id once). */
export async function waitingRows(db: RhythmDb, limit: number): Promise<OutboxRow[]> {
  const rows = await db.outbox.where('status').anyOf('pending', 'sending').toArray();
  return rows.sort((a, b) => (a.seq ?? 0) - (b.seq ?? 0)).slice(0, limit);
}

/** Writes a change's answer onto its record (read, amendment or handover), where the nurse sees it. */
export async function setRecordStatus(db: RhythmDb, change: Change, answer: { status: 'accepted' } | { status: 'rejected' | 'pending'; reason: string }): Promise<void> {
  const patch = answer.status === 'accepted' ? { syncStatus: 'accepted' as const, rejectReason: undefined } : { syncStatus: answer.status, rejectReason: answer.reason };
  if (change.kind === 'read.sign') await db.reads.update(change.record.id, patch);
  else if (change.kind === 'amendment.add') await db.amendments.update(change.record.id, patch);
  else if (change.kind === 'handover.put') await db.handovers.update(change.record.id, patch);
}

/**
 * Once no edit of a whole record waits to send any more, the table shows the newest version the
 * server holds: the tablet's own accepted edit, or a later one pulled meanwhile, or (after a
 * refusal) the version before the refused edit. A refused handover keeps the nurse's text on
 * screen with its reason instead, since it is clinical writing the nurse must see and redo.
 */
export async function settleRecord(db: RhythmDb, kind: PutKind, id: string, refused: boolean): Promise<void> {
  const stillWaiting = (await db.outbox.where('status').anyOf('pending', 'sending').toArray()).some((r) => r.kind === kind && r.change.record.id === id);
  if (stillWaiting) return;
  if (refused && kind === 'handover.put') return;
  const known = await readSyncSetting<ServerVersion>(db, serverVersionKey(kind, id));
  if (known) await putRecord(db, kind, known.record);
}

/** Applies one batch's answers: outbox rows, the records' own sync state and whole-record versions, in one transaction. */
async function applyAnswers(db: RhythmDb, rows: readonly OutboxRow[], results: readonly PushResult[], summary: PushSummary): Promise<void> {
  await db.transaction('rw', [...syncWriteTables], async () => {
    const touched = new Map<string, { kind: PutKind; id: string; refused: boolean }>();
    for (const [i, row] of rows.entries()) {
      const result = results[i]!;
      const attempts = row.attempts + 1;
      if (result.status === 'accepted') {
        await db.outbox.update(row.seq!, { status: 'accepted', attempts, rejectReason: undefined });
        await setRecordStatus(db, row.change, { status: 'accepted' });
        summary.accepted += 1;
      } else if (result.retryable) {
        // Not refused for good: the row keeps waiting and goes again; the reason shows why it waits.
        const reason = rejectReasonOf(result);
        await db.outbox.update(row.seq!, { status: 'pending', attempts, rejectReason: reason });
        await setRecordStatus(db, row.change, { status: 'pending', reason });
        summary.deferred += 1;
        summary.deferredReason ??= reason;
      } else {
        const reason = rejectReasonOf(result);
        await db.outbox.update(row.seq!, { status: 'rejected', attempts, rejectReason: reason });
        await setRecordStatus(db, row.change, { status: 'rejected', reason });
        summary.rejected += 1;
      }
      if (isPutKind(row.kind)) {
        const key = serverVersionKey(row.kind, row.change.record.id);
        if (result.status === 'accepted') {
          const known = await readSyncSetting<ServerVersion>(db, key);
          // An answer without a seq still means the server now holds this edit after everything the tablet pulled before.
          const seq = result.seq ?? known?.seq ?? 0;
          if (!known || known.seq <= seq) await writeSyncSetting(db, key, { seq, record: row.change.record } satisfies ServerVersion);
        }
        // Rows are in order, so the last answer for a record decides what it settles to.
        touched.set(key, { kind: row.kind, id: row.change.record.id, refused: result.status === 'rejected' && !result.retryable });
      }
    }
    for (const { kind, id, refused } of touched.values()) await settleRecord(db, kind, id, refused);
  });
}

async function countAttempt(db: RhythmDb, rows: readonly OutboxRow[]): Promise<void> {
  await db.transaction('rw', db.outbox, async () => {
    for (const row of rows) {
      const current = await db.outbox.get(row.seq!);
      if (current) await db.outbox.update(row.seq!, { attempts: current.attempts + 1 });
    }
  });
}

/**
 * Sends every waiting outbox row in order, in batches of at most 200, and records each answer.
 * A change refused only for now (the server says it may pass later) stays waiting with the reason
 * and is sent again on a later run, never twice in one push.
 * A change the signed-in account may not send (see waitsForRole) is not sent: it waits with the
 * reason until an account that may send it signs in.
 * A failed call leaves its rows waiting (one more attempt counted, except when the session has
 * ended, which is not the rows' fault) and stops the push; rows are never deleted, and a refused
 * change stays with its reason where the nurse sees it.
 */
export async function pushOutbox(
  db: RhythmDb,
  connection: ServerConnection,
  credentials: CallCredentials,
  batchSize: number = maxChangesPerPush,
  pusherRole: ServerUser['role'] | null = null,
): Promise<PushSummary> {
  const size = Math.max(1, Math.min(batchSize, maxChangesPerPush));
  const summary: PushSummary = { batches: 0, accepted: 0, rejected: 0, deferred: 0, deferredReason: null };
  const sentSeqs = new Set<number>();
  for (;;) {
    // A row answered (or held back) in this push is never sent twice in it, even if a retry raced its answer.
    const candidates = (await waitingRows(db, size + sentSeqs.size)).filter((r) => !sentSeqs.has(r.seq!)).slice(0, size);
    if (candidates.length === 0) return summary;
    const rows: OutboxRow[] = [];
    for (const row of candidates) {
      const waits = pusherRole === null ? null : waitsForRole(row.kind, pusherRole);
      if (waits === null) {
        rows.push(row);
        continue;
      }
      await db.outbox.update(row.seq!, { rejectReason: waits });
      sentSeqs.add(row.seq!);
      summary.deferred += 1;
      summary.deferredReason ??= waits;
    }
    if (rows.length === 0) continue;
    let results: PushResult[];
    try {
      const answer = await callServer(connection, { method: 'POST', path: '/api/sync/push', body: { changes: rows.map((r) => r.change) }, credentials, schema: pushResponseSchema });
      results = matchResults(rows, answer.results);
    } catch (error) {
      if (!(error instanceof SyncError && error.kind === 'signed-out')) await countAttempt(db, rows);
      throw error;
    }
    await applyAnswers(db, rows, results, summary);
    for (const row of rows) sentSeqs.add(row.seq!);
    summary.batches += 1;
  }
}
