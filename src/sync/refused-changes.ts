import type { ChangeKind } from '../core/records.ts';
import type { OutboxRow, RhythmDb } from '../store/db.ts';
import type { RefusedSeen } from './sync-settings.ts';
import { readSyncSetting, refusedSeenKey, writeSyncSetting } from './sync-settings.ts';

/** One change the unit server refused for good, with what the nurse needs to find and redo it. */
export interface RefusedChange {
  changeId: string;
  kind: ChangeKind;
  recordId: string;
  /** The server's reason, as it was answered. */
  reason: string;
  /** When the change was made on this tablet. */
  madeAtMs: number;
  /** Null until a nurse marks it as seen; it is never removed. */
  seen: RefusedSeen | null;
  /** The bed the change belongs to, where there is one on this tablet. */
  bedId: string | null;
  bedLabel: string | null;
  /** The patient's alias on that bed's stay. */
  alias: string | null;
  /** The read, for reads and amendments. */
  readId: string | null;
  stripTimeMs: number | null;
  /** Who the change names as its author (reads, amendments, handovers). */
  authorName: string | null;
}

/** How many refused changes there are: not yet seen (reads among them), and seen. */
export interface RefusedCounts {
  unseen: number;
  unseenReads: number;
  seen: number;
}

/** The refused changes marked as seen, by change id. */
export async function refusedSeenMarks(db: RhythmDb): Promise<Record<string, RefusedSeen>> {
  return (await readSyncSetting<Record<string, RefusedSeen>>(db, refusedSeenKey)) ?? {};
}

/** Counts refused outbox rows against the seen marks. */
export function countRefused(rows: readonly Pick<OutboxRow, 'changeId' | 'kind'>[], seen: Record<string, RefusedSeen>): RefusedCounts {
  const unseenRows = rows.filter((r) => !seen[r.changeId]);
  return { unseen: unseenRows.length, unseenReads: unseenRows.filter((r) => r.kind === 'read.sign').length, seen: rows.length - unseenRows.length };
}

/** The counts the sync line shows; reads the outbox and the seen marks, so a live query follows both. */
export async function refusedCounts(db: RhythmDb): Promise<RefusedCounts> {
  const [rows, seen] = await Promise.all([db.outbox.where('status').equals('rejected').toArray(), refusedSeenMarks(db)]);
  return countRefused(rows, seen);
}

async function placeOf(db: RhythmDb, row: OutboxRow): Promise<Pick<RefusedChange, 'bedId' | 'readId' | 'stripTimeMs' | 'authorName'> & { stayId: string | null }> {
  const change = row.change;
  switch (change.kind) {
    case 'read.sign':
      return { bedId: change.record.bedId, stayId: change.record.stayId, readId: change.record.id, stripTimeMs: change.record.stripTimeMs, authorName: change.record.authorName };
    case 'amendment.add': {
      const read = await db.reads.get(change.record.readId);
      return { bedId: null, stayId: change.record.stayId, readId: change.record.readId, stripTimeMs: read?.stripTimeMs ?? null, authorName: change.record.authorName };
    }
    case 'handover.put':
      return { bedId: null, stayId: change.record.stayId, readId: null, stripTimeMs: null, authorName: change.record.givenByName };
    case 'stay.put':
      return { bedId: change.record.bedId, stayId: change.record.id, readId: null, stripTimeMs: null, authorName: null };
    case 'bed.put':
      return { bedId: change.record.id, stayId: null, readId: null, stripTimeMs: null, authorName: null };
    case 'unit.put':
      return { bedId: null, stayId: null, readId: null, stripTimeMs: null, authorName: null };
  }
}

/** Every refused change on this tablet, newest first, with its bed, patient alias and read where known. */
export async function listRefusedChanges(db: RhythmDb): Promise<RefusedChange[]> {
  const [rows, seen] = await Promise.all([db.outbox.where('status').equals('rejected').toArray(), refusedSeenMarks(db)]);
  const listed: RefusedChange[] = [];
  for (const row of rows.sort((a, b) => (b.seq ?? 0) - (a.seq ?? 0))) {
    const place = await placeOf(db, row);
    const stay = place.stayId ? await db.stays.get(place.stayId) : undefined;
    const bedId = place.bedId ?? stay?.bedId ?? null;
    const bed = bedId ? await db.beds.get(bedId) : undefined;
    listed.push({
      changeId: row.changeId,
      kind: row.kind,
      recordId: row.change.record.id,
      reason: row.rejectReason ?? 'The unit server refused this change without giving a reason; ask the unit admin.',
      madeAtMs: row.createdAtMs,
      seen: seen[row.changeId] ?? null,
      bedId,
      bedLabel: bed?.label ?? null,
      alias: stay?.alias ?? null,
      readId: place.readId,
      stripTimeMs: place.stripTimeMs,
      authorName: place.authorName,
    });
  }
  return listed;
}

/**
 * Marks a refused change as seen by a clinician. The change, its record and the reason all stay on
 * the tablet; only the sync line stops counting it as news.
 */
export async function markRefusedSeen(db: RhythmDb, changeId: string, by: { id: string; name: string }, nowMs: number): Promise<void> {
  await db.transaction('rw', [db.outbox, db.settings], async () => {
    const row = await db.outbox.where('changeId').equals(changeId).first();
    if (row?.status !== 'rejected') return;
    const marks = await refusedSeenMarks(db);
    if (marks[changeId]) return;
    await writeSyncSetting(db, refusedSeenKey, { ...marks, [changeId]: { seenAtMs: nowMs, seenById: by.id, seenByName: by.name } satisfies RefusedSeen });
  });
}
