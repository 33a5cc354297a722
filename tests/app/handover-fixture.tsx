import { render } from '@testing-library/preact';
import type { ComponentChildren } from 'preact';
import { vi } from 'vitest';
import { ChartingContext } from '../../src/app/app-context.ts';
import type { Bed, ReadCounts, SignedRead, Stay, Unit } from '../../src/core/records.ts';
import { addClinician } from '../../src/store/clinicians.ts';
import type { ClinicianRow, RhythmDb, StoredRead } from '../../src/store/db.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import type { SyncEngine, SyncState } from '../../src/sync/sync-engine.ts';
import { newTestDb, unit } from '../store/fixtures.ts';

// An invented ward of four beds whose reads came from three tablets (three nurses, three device
// ids), as the charge nurse's tablet holds them after pulling from the unit server.

export const hourMs = 3_600_000;
/** 18:30 on 10 March 2026 in London (GMT): the Day shift, 07:00 to 19:00, is ending. */
export const deskNowMs = Date.UTC(2026, 2, 10, 18, 30);
export const dayShiftKey = '2026-03-10/Day';

export const deskUnit: Unit = { ...unit, id: 'unit-desk-0001', name: '4 East Telemetry (test)', updatedAtMs: deskNowMs - 100 * hourMs };

export const ann = { id: 'clin-desk-ann', name: 'Ann Ward' };
export const bob = { id: 'clin-desk-bob', name: 'Bob Ward' };
export const cara = { id: 'clin-desk-cara', name: 'Cara Ward' };
export const pins = { [ann.id]: '1234', [bob.id]: '2345', [cara.id]: '3456' } as const;

export const beds: Bed[] = [1, 2, 3, 4].map((n) => ({ id: `bed-desk-000${n}`, unitId: deskUnit.id, label: `Bed ${n}`, sortOrder: n - 1, active: true }));

const stayOf = (n: number, alias: string, sex: Stay['sex'], startHoursAgo: number, extra: Partial<Stay> = {}): Stay => ({
  id: `stay-desk-000${n}`,
  unitId: deskUnit.id,
  bedId: `bed-desk-000${n}`,
  alias,
  sex,
  paced: false,
  bundleBranchBlock: false,
  qtProlongingDrugs: '',
  notes: '',
  startMs: deskNowMs - startHoursAgo * hourMs,
  endMs: null,
  updatedAtMs: deskNowMs - startHoursAgo * hourMs,
  updatedBy: 'Test Admin',
  ...extra,
});

/** Bed 1: K.L., quiet; bed 2: M.N., QTc high (urgent); bed 3: O.P., overdue; bed 4 empty. */
export const stays: Stay[] = [stayOf(1, 'K.L.', 'male', 20), stayOf(2, 'M.N.', 'female', 20, { baselineQtcMs: 430 }), stayOf(3, 'O.P.', 'male', 20)];

/** R-R 20 small boxes at 25 mm/s = 800 ms, 75 bpm; QT 10 boxes = 400 ms, QTc (Fridericia) 400 / 0.8^(1/3) = 431 ms (Fridericia 1920, arithmetic). */
export const quietCounts: ReadCounts = { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [20, 20], ppSmallBoxes: [], prSmallBoxes: 4, qrsSmallBoxes: 2, qtSmallBoxes: 10, rhythmLabel: 'sinus-rhythm', avBlockNoted: false };
/** QT 13 boxes = 520 ms at R-R 800 ms: QTc (Fridericia) 560 ms, at or above the 500 ms high-risk limit (Drew et al. 2010, AHA/ACCF statement). */
export const longQtCounts: ReadCounts = { ...quietCounts, qtSmallBoxes: 13 };

function read(stay: Stay, hoursAgo: number, author: { id: string; name: string }, deviceId: string, counts: ReadCounts, n: number): StoredRead {
  const stripTimeMs = deskNowMs - hoursAgo * hourMs;
  const record: SignedRead = {
    id: `read-${stay.id}-${String(n).padStart(2, '0')}`,
    unitId: deskUnit.id,
    bedId: stay.bedId,
    stayId: stay.id,
    stripTimeMs,
    enteredAtMs: stripTimeMs + 60_000,
    signedAtMs: stripTimeMs + 120_000,
    authorId: author.id,
    authorName: author.name,
    deviceId,
    reason: 'routine',
    counts,
  };
  return { ...record, analysis: null, syncStatus: 'accepted' };
}

/** Reads of the three tablets: bed 1 from tablet one (Ann), bed 2 from tablet two (Bob), bed 3 from tablet three (Cara). */
export const reads: StoredRead[] = [
  ...[14.5, 10.5, 6.5, 2.5].map((h, i) => read(stays[0]!, h, ann, 'tablet-one', quietCounts, i)),
  ...[12, 8, 4, 1].map((h, i) => read(stays[1]!, h, bob, 'tablet-two', longQtCounts, i)),
  ...[13, 9].map((h, i) => read(stays[2]!, h, cara, 'tablet-three', quietCounts, i)),
];

/** A tablet store holding the ward, its reads, and the three nurses with PINs (cheap hashing for speed). */
export async function deskDb(): Promise<RhythmDb> {
  const db = newTestDb();
  await db.units.put(deskUnit);
  await db.beds.bulkPut(beds);
  await db.stays.bulkPut(stays);
  await db.reads.bulkPut(reads);
  for (const c of [ann, bob, cara]) await addClinician(db, { id: c.id, name: c.name, role: 'nurse', pin: pins[c.id]!, iterations: 1000 }, deskNowMs - 50 * hourMs);
  return db;
}

export const clinicianRow = (who: { id: string; name: string }, role: ClinicianRow['role'] = 'nurse'): ClinicianRow => ({
  id: who.id,
  name: who.name,
  role,
  pinHash: 'x',
  pinSalt: 'x',
  pinIterations: 1,
  active: true,
  createdAtMs: 0,
});

/** A sync engine that only reports a state (the desk reads nothing else from it). */
export function fakeSyncEngine(patch: Partial<SyncState>): SyncEngine {
  const state: SyncState = {
    lastSyncedAtMs: null,
    pendingCount: 0,
    rejectedCount: 0,
    rejectedReadCount: 0,
    lastError: null,
    lastErrorKind: null,
    running: false,
    signedIn: true,
    online: true,
    nextRetryAtMs: null,
    failuresInRow: 0,
    ...patch,
  };
  return {
    getState: () => state,
    subscribe: () => () => undefined,
    syncNow: async () => ({ ok: false, error: new Error('not in tests') }) as never,
    start: () => undefined,
    stop: () => undefined,
    refresh: async () => undefined,
  };
}

/** The wall clock fixed at `atMs` (Date only, so IndexedDB's own timers still run). */
export function fixClock(atMs: number = deskNowMs): void {
  vi.useFakeTimers({ toFake: ['Date'] });
  vi.setSystemTime(atMs);
}

/** Renders a handover screen as the clinician on a tablet holding the desk ward. */
export function renderDesk(ui: ComponentChildren, options: { db: RhythmDb; clinician?: ClinicianRow; sync?: SyncEngine | null; demoWard?: boolean }) {
  return render(
    <ChartingContext.Provider
      value={{ db: options.db, deviceId: 'tablet-charge', unit: deskUnit, policy: unitPolicyOf(deskUnit), clinician: options.clinician ?? clinicianRow(cara, 'charge-nurse'), demoWard: options.demoWard ?? false, sync: options.sync ?? null }}
    >
      {ui}
    </ChartingContext.Provider>,
  );
}
