import type { Change } from '../core/records.ts';
import type { OutboxRow, RhythmDb } from './db.ts';
import { demoIdPrefix } from './demo-ward.ts';

/** The outbox row for a change made now: pending, never sent. */
export function outboxEntry(change: Change, nowMs: number): OutboxRow {
  return { changeId: change.changeId, kind: change.kind, change, createdAtMs: nowMs, status: 'pending', attempts: 0 };
}

/** True for a change to the invented demo ward, which must never reach a real unit server. */
export function isDemoChange(change: Change): boolean {
  const unitId = change.kind === 'unit.put' ? change.record.id : change.record.unitId;
  return unitId.startsWith(demoIdPrefix);
}

/** Queues a change for the unit server; call inside the transaction that writes its record. Demo-ward changes stay on the tablet. */
export async function enqueueChange(db: RhythmDb, change: Change, nowMs: number): Promise<void> {
  if (isDemoChange(change)) return;
  await db.outbox.add(outboxEntry(change, nowMs));
}
