import type { Change } from '../core/records.ts';
import type { OutboxRow } from './db.ts';

/** The outbox row for a change made now: pending, never sent. */
export function outboxEntry(change: Change, nowMs: number): OutboxRow {
  return { changeId: change.changeId, kind: change.kind, change, createdAtMs: nowMs, status: 'pending', attempts: 0 };
}
