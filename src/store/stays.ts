import { ValidationError } from '../core/field-error.ts';
import type { Stay } from '../core/records.ts';
import type { RhythmDb } from './db.ts';
import { checkedStay, putStayWithChange } from './put-records.ts';
import { withStorageFullCheck } from './storage-full.ts';

/**
 * Starts monitoring a patient on a bed. One transaction with the outbox change, and refused while
 * another stay is still open on that bed, so a bed never shows two patients on this tablet.
 * Two tablets offline could each admit to one bed: both stays keep their own ids and the server
 * shows the clash to the charge nurse rather than dropping either.
 */
export async function admitStay(db: RhythmDb, stay: Stay, nowMs: number): Promise<void> {
  const checked = checkedStay(stay);
  await withStorageFullCheck(() =>
    db.transaction('rw', [db.stays, db.outbox], async () => {
      const open = (await db.stays.where('bedId').equals(checked.bedId).toArray()).find((s) => s.id !== checked.id && s.endMs === null);
      if (open) throw new ValidationError([{ field: 'bedId', message: `bedId: ${open.alias} is still monitored on this bed; end that monitoring first.` }]);
      await putStayWithChange(db, checked, nowMs);
    }),
  );
}

/** Updates a stay's details (alias, pacing, drugs, baseline QTc) with its outbox change. */
export async function updateStay(db: RhythmDb, stay: Stay, nowMs: number): Promise<void> {
  const checked = checkedStay({ ...stay, updatedAtMs: nowMs });
  await withStorageFullCheck(() => db.transaction('rw', [db.stays, db.outbox], () => putStayWithChange(db, checked, nowMs)));
}

/** Ends monitoring of a stay at a time; its reads stay on record. */
export async function endStay(db: RhythmDb, stayId: string, endMs: number, updatedBy: string, nowMs: number): Promise<void> {
  await withStorageFullCheck(() =>
    db.transaction('rw', [db.stays, db.outbox], async () => {
      const stay = await db.stays.get(stayId);
      if (!stay) throw new ValidationError([{ field: 'stayId', message: 'stayId: this patient is not on this tablet.' }]);
      await putStayWithChange(db, checkedStay({ ...stay, endMs, updatedAtMs: nowMs, updatedBy }), nowMs);
    }),
  );
}
