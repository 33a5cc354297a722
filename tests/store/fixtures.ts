import type { Bed, ReadCounts, Stay, Unit } from '../../src/core/records.ts';
import { RhythmDb } from '../../src/store/db.ts';
import { newReadForm } from '../../src/app/read-form-values.ts';
import type { ReadDraftForm } from '../../src/store/read-draft.ts';

let dbCount = 0;
/** A fresh, empty tablet database on fake-indexeddb. */
export function newTestDb(): RhythmDb {
  dbCount += 1;
  return new RhythmDb(`test-${dbCount}-${Math.random().toString(36).slice(2)}`);
}

export const t0 = Date.UTC(2026, 2, 10, 8, 0);
export const hourMs = 3_600_000;

export const unit: Unit = {
  id: 'unit-test-0001',
  name: 'Test unit',
  timeZone: 'Europe/London',
  shiftPattern: { shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
  readIntervalHours: 4,
  defaultPaperSpeedMmPerS: 25,
  defaultGainMmPerMv: 10,
  idleLockMinutes: 5,
  policyOverrides: [],
  updatedAtMs: t0,
};

export const bed: Bed = { id: 'bed-test-0001', unitId: unit.id, label: 'Bed 1', sortOrder: 0, active: true };

export const stay: Stay = {
  id: 'stay-test-0001',
  unitId: unit.id,
  bedId: bed.id,
  alias: 'Q.Z.',
  sex: 'female',
  paced: false,
  bundleBranchBlock: false,
  qtProlongingDrugs: '',
  baselineQtcMs: 430,
  notes: '',
  startMs: t0 - 10 * hourMs,
  endMs: null,
  updatedAtMs: t0 - 10 * hourMs,
  updatedBy: 'Test Admin',
};

/** 20 small boxes at 25 mm/s is an R-R of 800 ms (75 bpm); QT 10 boxes is 400 ms. */
export const normalCounts: ReadCounts = {
  paperSpeedMmPerS: 25,
  gainMmPerMv: 10,
  rrSmallBoxes: [20, 20],
  ppSmallBoxes: [],
  prSmallBoxes: 4,
  qrsSmallBoxes: 2,
  qtSmallBoxes: 10,
  rhythmLabel: 'sinus-rhythm',
  avBlockNoted: false,
};

export const author = { id: 'clin-test-ann', name: 'Ann Test' };
export const otherAuthor = { id: 'clin-test-bob', name: 'Bob Test' };

/** A blank read form at t0 (08:00 ward time in March, London on GMT), as the new-read screen starts it. */
export const emptyForm: ReadDraftForm = newReadForm(unit, t0);

/** A database holding the test unit, bed and stay. */
export async function seededDb(): Promise<RhythmDb> {
  const db = newTestDb();
  await db.units.put(unit);
  await db.beds.put(bed);
  await db.stays.put(stay);
  return db;
}
