import type { ReadCounts, ReadReason, SignedRead, Stay, Unit, Bed } from '../core/records.ts';
import { shiftAt } from '../core/shifts.ts';
import type { ClinicianRole } from './db.ts';
import { uuidV7 } from './uuid-v7.ts';

/** An invented ward to try the app on: made-up hospital, unit, staff and patients (initials only). */
export interface DemoWard {
  unit: Unit;
  beds: Bed[];
  stays: Stay[];
  reads: SignedRead[];
  clinicians: Array<{ id: string; name: string; role: ClinicianRole; pin: string }>;
}

const hourMs = 3_600_000;
const minuteMs = 60_000;

/** Prefix of every demo id, so demo records are easy to tell apart (and never pushed to a real unit). */
export const demoIdPrefix = 'demo-';
export const demoUnitId = 'demo-unit-7-north';
export const demoDeviceId = 'demo-tablet';

/** Demo staff and their PINs, shown on the sign-in screen while the demo ward is loaded. */
export const demoClinicians = [
  { id: 'demo-clin-ash', name: 'Ash R. (demo nurse)', role: 'nurse', pin: '1111' },
  { id: 'demo-clin-birch', name: 'Birch T. (demo nurse)', role: 'nurse', pin: '2222' },
  { id: 'demo-clin-cedar', name: 'Cedar M. (demo charge nurse)', role: 'charge-nurse', pin: '3333' },
] as const satisfies ReadonlyArray<{ id: string; name: string; role: ClinicianRole; pin: string }>;

interface PatientPlan {
  bed: string;
  alias: string;
  sex: Stay['sex'];
  ageBand: NonNullable<Stay['ageBand']>;
  paced?: boolean;
  bundleBranchBlock?: boolean;
  qtProlongingDrugs?: string;
  baselineQtcMs?: number;
  notes?: string;
  /** Hours since monitoring began. */
  stayHours: number;
  /** Hours since the last read (more than the interval: the bed is overdue). */
  lastReadHoursAgo: number;
  /** Counts for read number i (0 = first); `share` runs 0..1 across the stay. */
  counts: (i: number, share: number) => Omit<ReadCounts, 'paperSpeedMmPerS' | 'gainMmPerMv' | 'ppSmallBoxes' | 'avBlockNoted'> & { avBlockNoted?: boolean };
  reasonOf?: (i: number, total: number) => ReadReason;
}

/** A small deterministic wobble (-1..1) so trends look like real strips without randomness. */
const wobble = (i: number, salt: number) => Math.sin(i * 1.7 + salt * 2.3);
const half = (v: number) => Math.round(v * 2) / 2;

const plans: PatientPlan[] = [
  {
    bed: '1', alias: 'J.K.', sex: 'male', ageBand: '40-69', baselineQtcMs: 410, stayHours: 62, lastReadHoursAgo: 1.5,
    counts: (i) => ({ rrSmallBoxes: [half(20 + wobble(i, 1)), half(20 + wobble(i + 1, 1))], prSmallBoxes: 4, qrsSmallBoxes: 2, qtSmallBoxes: 10, rhythmLabel: 'sinus-rhythm' }),
  },
  {
    bed: '2', alias: 'M.R.', sex: 'female', ageBand: '70+', baselineQtcMs: 440, qtProlongingDrugs: 'ondansetron IV (started yesterday)', stayHours: 50, lastReadHoursAgo: 0.75,
    notes: 'Potassium being replaced per protocol.',
    counts: (_i, share) => ({ rrSmallBoxes: [19, 19.5], prSmallBoxes: 4, qrsSmallBoxes: 2, qtSmallBoxes: half(10.5 + share * 2.5), rhythmLabel: 'sinus-rhythm' }),
    reasonOf: (i, total) => (i === total - 4 ? 'new-drug' : 'routine'),
  },
  {
    bed: '3', alias: 'T.O.', sex: 'male', ageBand: '70+', stayHours: 40, lastReadHoursAgo: 2,
    counts: (i) => ({ rrSmallBoxes: [14, half(19 + wobble(i, 3) * 2), 12, 22, 16.5], sixSecondQrsCount: 9 + Math.round(wobble(i, 4)), qrsSmallBoxes: 2, qtSmallBoxes: 8.5, rhythmLabel: 'atrial-fibrillation' }),
  },
  {
    bed: '4', alias: 'P.D.', sex: 'female', ageBand: '70+', paced: true, baselineQtcMs: 470, stayHours: 30, lastReadHoursAgo: 3,
    notes: 'Dual-chamber pacemaker, lower rate 70.',
    counts: () => ({ rrSmallBoxes: [21.5, 21.5], qrsSmallBoxes: 4, qtSmallBoxes: 11.5, rhythmLabel: 'paced-rhythm' }),
  },
  {
    bed: '5', alias: 'A.S.', sex: 'female', ageBand: '40-69', stayHours: 28, lastReadHoursAgo: 6.25,
    counts: (i) => ({ rrSmallBoxes: [half(27 + wobble(i, 5)), 27.5], prSmallBoxes: 4.5, qrsSmallBoxes: 2, qtSmallBoxes: 11, rhythmLabel: 'sinus-bradycardia' }),
  },
  {
    bed: '6', alias: 'L.W.', sex: 'male', ageBand: '40-69', stayHours: 20, lastReadHoursAgo: 3.6,
    counts: () => ({ rrSmallBoxes: [22, 22.5], prSmallBoxes: 6, qrsSmallBoxes: 2.5, qtSmallBoxes: 10, rhythmLabel: 'first-degree-av-block', avBlockNoted: true }),
  },
  {
    bed: '7', alias: 'R.B.', sex: 'female', ageBand: '16-39', stayHours: 16, lastReadHoursAgo: 1,
    counts: (i) => ({ rrSmallBoxes: [half(13.5 + wobble(i, 6) * 0.5), 13.5], prSmallBoxes: 3.5, qrsSmallBoxes: 2, qtSmallBoxes: 8.5, rhythmLabel: 'sinus-tachycardia' }),
  },
  {
    bed: '8', alias: 'C.N.', sex: 'male', ageBand: '70+', bundleBranchBlock: true, baselineQtcMs: 455, stayHours: 44, lastReadHoursAgo: 2.5,
    counts: () => ({ rrSmallBoxes: [18, 18.5], prSmallBoxes: 4.5, qrsSmallBoxes: 3.5, qtSmallBoxes: 11, rhythmLabel: 'sinus-rhythm' }),
  },
  {
    bed: '10', alias: 'H.F.', sex: 'male', ageBand: '40-69', stayHours: 0.4, lastReadHoursAgo: Number.POSITIVE_INFINITY,
    notes: 'Admitted from the emergency department; baseline read needed.',
    counts: () => ({ rrSmallBoxes: [20] }),
  },
];

/** Makes deterministic "random" bytes from a seed, so the demo is the same every time for the same time. */
function seededBytes(seed: number): (bytes: Uint8Array) => void {
  let state = (seed >>> 0) || 1;
  return (bytes) => {
    for (let i = 0; i < bytes.length; i += 1) {
      state ^= state << 13;
      state ^= state >>> 17;
      state ^= state << 5;
      bytes[i] = state & 0xff;
    }
  };
}

/** Builds the invented ward "Harbourside General, Ward 7 North (telemetry)" as of nowMs. Pure: the same time gives the same ward. */
export function buildDemoWard(nowMs: number): DemoWard {
  const at = Math.floor(nowMs);
  const unit: Unit = {
    id: demoUnitId,
    name: 'Harbourside General, Ward 7 North (telemetry) - DEMO',
    timeZone: 'Europe/London',
    shiftPattern: { shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
    readIntervalHours: 4,
    defaultPaperSpeedMmPerS: 25,
    defaultGainMmPerMv: 10,
    idleLockMinutes: 5,
    policyOverrides: [],
    updatedAtMs: at,
  };
  const bedLabels = ['1', '2', '3', '4', '5', '6', '7', '8', '9', '10'];
  const beds: Bed[] = bedLabels.map((label, i) => ({ id: `demo-bed-${label.padStart(2, '0')}`, unitId: unit.id, label: `Bed ${label}`, sortOrder: i, active: true }));
  const stays: Stay[] = [];
  const reads: SignedRead[] = [];
  plans.forEach((plan, p) => {
    const bedId = `demo-bed-${plan.bed.padStart(2, '0')}`;
    const startMs = at - Math.round(plan.stayHours * hourMs);
    const stay: Stay = {
      id: `demo-stay-${plan.bed.padStart(2, '0')}`,
      unitId: unit.id,
      bedId,
      alias: plan.alias,
      sex: plan.sex,
      ageBand: plan.ageBand,
      paced: plan.paced ?? false,
      bundleBranchBlock: plan.bundleBranchBlock ?? false,
      qtProlongingDrugs: plan.qtProlongingDrugs ?? '',
      notes: plan.notes ?? '',
      startMs,
      endMs: null,
      updatedAtMs: startMs,
      updatedBy: demoClinicians[2].name,
    };
    if (plan.baselineQtcMs !== undefined) stay.baselineQtcMs = plan.baselineQtcMs;
    stays.push(stay);
    if (!Number.isFinite(plan.lastReadHoursAgo)) return;
    // Reads every 4 h back from the last one, a few minutes late or early, down to the stay start.
    const lastMs = at - Math.round(plan.lastReadHoursAgo * hourMs);
    const times: number[] = [];
    for (let t = lastMs; t >= startMs; t -= 4 * hourMs) times.unshift(t + (times.length === 0 ? 0 : Math.round(wobble(times.length, p) * 12) * minuteMs));
    const random = seededBytes(at ^ (p * 7919));
    times.forEach((stripTimeMs, i) => {
      const share = times.length === 1 ? 1 : i / (times.length - 1);
      const { avBlockNoted, ...rest } = plan.counts(i, share);
      const counts: ReadCounts = { paperSpeedMmPerS: 25, gainMmPerMv: 10, ppSmallBoxes: [], avBlockNoted: avBlockNoted ?? false, ...rest };
      const author = shiftAt(stripTimeMs, unit.shiftPattern, unit.timeZone).name === 'Day' ? demoClinicians[0] : demoClinicians[1];
      const signedAtMs = Math.min(at, stripTimeMs + 3 * minuteMs);
      reads.push({
        id: uuidV7(signedAtMs, random),
        unitId: unit.id,
        bedId,
        stayId: stay.id,
        stripTimeMs,
        enteredAtMs: stripTimeMs + minuteMs,
        signedAtMs,
        authorId: author.id,
        authorName: author.name,
        deviceId: demoDeviceId,
        reason: plan.reasonOf?.(i, times.length) ?? 'routine',
        counts,
      });
    });
  });
  return { unit, beds, stays, reads, clinicians: demoClinicians.map((c) => ({ ...c })) };
}
