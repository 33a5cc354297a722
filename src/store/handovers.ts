import { ValidationError } from '../core/field-error.ts';
import { acknowledgeHandover as acknowledgedRecord, giveHandover } from '../core/handover-record.ts';
import type { HandoverSummary } from '../core/handover-summary.ts';
import type { Change, Handover } from '../core/records.ts';
import type { RhythmDb, StoredHandover } from './db.ts';
import { enqueueChange } from './outbox-entry.ts';
import type { Author } from './sign-read.ts';
import { withStorageFullCheck } from './storage-full.ts';
import { uuidV7 } from './uuid-v7.ts';

/** The giving nurse's handover of one stay for one shift: the generated summary plus their own words. */
export interface SaveHandoverInput {
  unitId: string;
  summary: HandoverSummary;
  nurseText: string;
  giver: Author;
  nowMs: number;
  /** A handover not yet received, given again by the same nurse (e.g. after a late read); a new record otherwise. */
  replacesId?: string;
  /** Preset id (tests); a new UUID v7 otherwise. */
  id?: string;
}

/** Refused because the handover was already received, or someone else gave it. */
export class HandoverLockedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'HandoverLockedError';
  }
}

async function putWithChange(db: RhythmDb, record: Handover, nowMs: number): Promise<StoredHandover> {
  const stored: StoredHandover = { ...record, syncStatus: 'pending' };
  const change: Change = { changeId: uuidV7(nowMs), kind: 'handover.put', deviceTimeMs: nowMs, record };
  await db.handovers.put(stored);
  await enqueueChange(db, change, nowMs);
  return stored;
}

/**
 * Gives a handover: the record and its outbox change are one transaction, so the tablet never shows
 * a handover the server will not hear of. Safe with two tablets offline: each handover has its own
 * id; a second nurse writing the same bed on another tablet makes a second record, and both stay
 * (the desk shows the latest given). Giving again replaces only an unreceived record of the same giver.
 */
export async function saveHandover(db: RhythmDb, input: SaveHandoverInput): Promise<StoredHandover> {
  return withStorageFullCheck(() =>
    db.transaction('rw', [db.handovers, db.outbox], async () => {
      let id = input.id ?? uuidV7(input.nowMs);
      if (input.replacesId !== undefined) {
        const before = await db.handovers.get(input.replacesId);
        if (!before) throw new ValidationError([{ field: 'replacesId', message: 'replacesId: that handover is not on this tablet.' }]);
        if (before.receivedById !== undefined) throw new HandoverLockedError(`This handover was already received by ${before.receivedByName ?? 'another nurse'}; it stays as written.`);
        if (before.givenById !== input.giver.id) throw new HandoverLockedError(`Only ${before.givenByName}, who gave this handover, may give it again.`);
        id = before.id;
      }
      const record = giveHandover({
        id,
        unitId: input.unitId,
        summary: input.summary,
        nurseText: input.nurseText.trim(),
        givenById: input.giver.id,
        givenByName: input.giver.name,
        givenAtMs: input.nowMs,
      });
      return putWithChange(db, record, input.nowMs);
    }),
  );
}

/**
 * Records the receiving nurse's acknowledgement (name and time) on a given handover, with its outbox
 * change, in one transaction. The core refuses the giver's own acknowledgement and a second one.
 * Two tablets acknowledging the same handover offline both send; the server keeps the later in its
 * order, and each receipt stays in the audit trail.
 */
export async function acknowledgeHandover(db: RhythmDb, input: { handoverId: string; receiver: Author; nowMs: number }): Promise<StoredHandover> {
  return withStorageFullCheck(() =>
    db.transaction('rw', [db.handovers, db.outbox], async () => {
      const stored = await db.handovers.get(input.handoverId);
      if (!stored) throw new ValidationError([{ field: 'handoverId', message: 'handoverId: that handover is not on this tablet.' }]);
      const { syncStatus: _syncStatus, rejectReason: _rejectReason, ...record } = stored;
      return putWithChange(db, acknowledgedRecord(record, input.receiver, input.nowMs), input.nowMs);
    }),
  );
}
