import { randomUUID } from 'node:crypto';
import type { Amendment, Bed, Change, Handover, SignedRead, Stay, Unit } from '../../src/core/records.ts';

/** Invented demo records: "Harbour View General", unit "4 West Telemetry", patients by initials only. */

export const baseTimeMs = Date.UTC(2031, 2, 3, 7, 0, 0);

export function demoUnit(overrides: Partial<Unit> = {}): Unit {
  return {
    id: randomUUID(),
    name: '4 West Telemetry',
    timeZone: 'Europe/Dublin',
    shiftPattern: { shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
    readIntervalHours: 4,
    defaultPaperSpeedMmPerS: 25,
    defaultGainMmPerMv: 10,
    idleLockMinutes: 5,
    policyOverrides: [],
    updatedAtMs: baseTimeMs,
    ...overrides,
  };
}

export function demoBed(unitId: string, label = 'Bed 1', overrides: Partial<Bed> = {}): Bed {
  return { id: randomUUID(), unitId, label, sortOrder: 1, active: true, ...overrides };
}

export function demoStay(unitId: string, bedId: string, overrides: Partial<Stay> = {}): Stay {
  return {
    id: randomUUID(),
    unitId,
    bedId,
    alias: 'J.K.',
    sex: 'female',
    paced: false,
    bundleBranchBlock: false,
    qtProlongingDrugs: '',
    notes: '',
    startMs: baseTimeMs,
    endMs: null,
    updatedAtMs: baseTimeMs,
    updatedBy: 'R. Nurse',
    ...overrides,
  };
}

/**
 * A plain sinus read at 25 mm/s: R-R 20 small boxes (800 ms, 75 bpm), PR 4 (160 ms), QRS 2 (80 ms), QT 9 (360 ms).
 * 1500 / 20 = 75 bpm: common practice (1500 rule at 25 mm/s), see clinical-reference.md 2.x.
 */
export function demoRead(stay: Stay, authorId: string, overrides: Partial<SignedRead> = {}): SignedRead {
  return {
    id: randomUUID(),
    unitId: stay.unitId,
    bedId: stay.bedId,
    stayId: stay.id,
    stripTimeMs: baseTimeMs,
    enteredAtMs: baseTimeMs + 60_000,
    signedAtMs: baseTimeMs + 90_000,
    authorId,
    authorName: 'R. Nurse',
    deviceId: 'tablet-a',
    reason: 'routine',
    counts: { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [20, 20, 20], ppSmallBoxes: [], prSmallBoxes: 4, qrsSmallBoxes: 2, qtSmallBoxes: 9, rhythmLabel: 'sinus-rhythm', avBlockNoted: false },
    ...overrides,
  };
}

export function demoAmendment(read: SignedRead, authorId: string, changes: Amendment['changes'], overrides: Partial<Amendment> = {}): Amendment {
  return {
    id: randomUUID(),
    readId: read.id,
    unitId: read.unitId,
    stayId: read.stayId,
    changes,
    reason: 'Recounted the QT on the strip',
    authorId,
    authorName: 'R. Nurse',
    deviceId: 'tablet-a',
    createdAtMs: read.signedAtMs + 600_000,
    ...overrides,
  };
}

export function demoHandover(stay: Stay, givenById: string, overrides: Partial<Handover> = {}): Handover {
  return {
    id: randomUUID(),
    unitId: stay.unitId,
    stayId: stay.id,
    shiftKey: '2031-03-03/Day',
    nurseText: 'Settled shift; reads as charted.',
    givenById,
    givenByName: 'R. Nurse',
    givenAtMs: baseTimeMs + 12 * 3_600_000,
    coveredRecordIds: [],
    ...overrides,
  };
}

/** Wraps a record as an outbox change with its own id. */
export function changeOf<K extends Change['kind']>(kind: K, record: Extract<Change, { kind: K }>['record'], deviceTimeMs = baseTimeMs): Change {
  return { changeId: randomUUID(), kind, deviceTimeMs, record } as Change;
}
