import { ValidationError } from '../core/field-error.ts';
import { fieldErrorsFromZod } from '../core/read-input.ts';
import type { Bed, Change, Stay, Unit } from '../core/records.ts';
import { bedSchema, staySchema, unitSchema } from '../core/records.ts';
import type { RhythmDb } from './db.ts';
import { enqueueChange } from './outbox-entry.ts';
import { uuidV7 } from './uuid-v7.ts';

/** Validates a unit, naming each bad field. */
export function checkedUnit(unit: Unit): Unit {
  const parsed = unitSchema.safeParse(unit);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  return parsed.data;
}

/** Validates a bed, naming each bad field. */
export function checkedBed(bed: Bed): Bed {
  const parsed = bedSchema.safeParse(bed);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  return parsed.data;
}

/** Validates a stay, naming each bad field. */
export function checkedStay(stay: Stay): Stay {
  const parsed = staySchema.safeParse(stay);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  if (parsed.data.endMs !== null && parsed.data.endMs < parsed.data.startMs) {
    throw new ValidationError([{ field: 'endMs', message: 'endMs: monitoring cannot end before it started.' }]);
  }
  return parsed.data;
}

/** Writes a unit and queues its outbox change; call inside a transaction over units and outbox. */
export async function putUnitWithChange(db: RhythmDb, unit: Unit, nowMs: number): Promise<void> {
  const change: Change = { changeId: uuidV7(nowMs), kind: 'unit.put', deviceTimeMs: nowMs, record: unit };
  await db.units.put(unit);
  await enqueueChange(db, change, nowMs);
}

/** Writes a bed and its outbox change; call inside a transaction over beds and outbox. */
export async function putBedWithChange(db: RhythmDb, bed: Bed, nowMs: number): Promise<void> {
  const change: Change = { changeId: uuidV7(nowMs), kind: 'bed.put', deviceTimeMs: nowMs, record: bed };
  await db.beds.put(bed);
  await enqueueChange(db, change, nowMs);
}

/** Writes a stay and its outbox change; call inside a transaction over stays and outbox. */
export async function putStayWithChange(db: RhythmDb, stay: Stay, nowMs: number): Promise<void> {
  const change: Change = { changeId: uuidV7(nowMs), kind: 'stay.put', deviceTimeMs: nowMs, record: stay };
  await db.stays.put(stay);
  await enqueueChange(db, change, nowMs);
}
