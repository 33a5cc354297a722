import { ValidationError } from '../core/field-error.ts';
import type { Bed, Unit } from '../core/records.ts';
import { policyOverrideSchema } from '../core/records.ts';
import { fieldErrorsFromZod } from '../core/read-input.ts';
import { validateShiftPattern } from '../core/shifts.ts';
import type { RhythmDb } from './db.ts';
import { checkedBed, checkedUnit, putBedWithChange, putUnitWithChange } from './put-records.ts';
import { withStorageFullCheck } from './storage-full.ts';

type PolicyOverrideRecord = Unit['policyOverrides'][number];

function checkedUnitAndPattern(unit: Unit): Unit {
  const checked = checkedUnit(unit);
  const patternProblems = validateShiftPattern(checked.shiftPattern);
  if (patternProblems.length > 0) throw new ValidationError(patternProblems.map((message) => ({ field: 'shiftPattern', message: `shiftPattern: ${message}` })));
  try {
    new Intl.DateTimeFormat('en', { timeZone: checked.timeZone });
  } catch {
    throw new ValidationError([{ field: 'timeZone', message: `timeZone: "${checked.timeZone}" is not a known time zone (e.g. Europe/London).` }]);
  }
  return checked;
}

/**
 * Sets up (or re-saves) a unit with its beds and makes it this tablet's unit. One transaction with
 * the outbox changes: a half-set-up unit never exists. Safe with two tablets offline: units and beds
 * carry their own ids and the server keeps the latest change of each record.
 */
export async function saveUnitSetup(db: RhythmDb, setup: { unit: Unit; beds: Bed[] }, nowMs: number): Promise<void> {
  const unit = checkedUnitAndPattern(setup.unit);
  const beds = setup.beds.map(checkedBed);
  const labels = new Set<string>();
  for (const bed of beds) {
    if (bed.unitId !== unit.id) throw new ValidationError([{ field: 'beds', message: `beds: bed ${bed.label} belongs to another unit.` }]);
    const key = bed.label.trim().toLowerCase();
    if (labels.has(key)) throw new ValidationError([{ field: 'beds', message: `beds: the label "${bed.label}" is used twice; give each bed its own label.` }]);
    labels.add(key);
  }
  await withStorageFullCheck(() =>
    db.transaction('rw', [db.units, db.beds, db.outbox, db.settings], async () => {
      await putUnitWithChange(db, unit, nowMs);
      for (const bed of beds) await putBedWithChange(db, bed, nowMs);
      await db.settings.put({ key: 'currentUnitId', value: unit.id });
    }),
  );
}

/** Saves a unit's settings (name, time zone, shifts, interval, defaults) with its outbox change. */
export async function saveUnitSettings(db: RhythmDb, unit: Unit, nowMs: number): Promise<void> {
  const checked = checkedUnitAndPattern({ ...unit, updatedAtMs: nowMs });
  await withStorageFullCheck(() => db.transaction('rw', [db.units, db.outbox], () => putUnitWithChange(db, checked, nowMs)));
}

/** Saves one bed (added, renamed or taken out of use) with its outbox change. */
export async function saveBed(db: RhythmDb, bed: Bed, nowMs: number): Promise<void> {
  const checked = checkedBed(bed);
  await withStorageFullCheck(() =>
    db.transaction('rw', [db.beds, db.outbox], async () => {
      const clash = (await db.beds.where('unitId').equals(checked.unitId).toArray()).find(
        (b) => b.id !== checked.id && b.active && b.label.trim().toLowerCase() === checked.label.trim().toLowerCase(),
      );
      if (clash) throw new ValidationError([{ field: 'label', message: `label: another bed is already called "${checked.label}".` }]);
      await putBedWithChange(db, checked, nowMs);
    }),
  );
}

/**
 * Records a change to the unit policy (a threshold, the QTc formula) with who, when and why; the
 * history is kept in order and the policy in force is the defaults with every change applied.
 */
export async function changeUnitPolicy(db: RhythmDb, unitId: string, change: PolicyOverrideRecord, nowMs: number): Promise<Unit> {
  const parsed = policyOverrideSchema.safeParse(change);
  if (!parsed.success) throw new ValidationError(fieldErrorsFromZod(parsed.error));
  return withStorageFullCheck(() =>
    db.transaction('rw', [db.units, db.outbox], async () => {
      const unit = await db.units.get(unitId);
      if (!unit) throw new ValidationError([{ field: 'unitId', message: 'unitId: this unit is not on this tablet.' }]);
      const next = checkedUnit({ ...unit, policyOverrides: [...unit.policyOverrides, parsed.data], updatedAtMs: nowMs });
      await putUnitWithChange(db, next, nowMs);
      return next;
    }),
  );
}
