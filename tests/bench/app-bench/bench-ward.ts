// An invented ward for the tablet benches: beds with a stay each, q4h reads over some days, generated
// the same way every run. Counts are plausible strips at 25 mm/s in half boxes.
import type { Bed, ReadCounts, SignedRead, Stay, Unit } from '../../../src/core/records.ts';
import { repeatableRandom } from '../bench-helpers.ts';

const hourMs = 3_600_000;

/** The bench ward; its clock is passed in, never read here. */
export function benchUnit(nowMs: number): Unit {
  return {
    id: 'unit-bench-tablet',
    name: 'Bench ward, Linden Hill Hospital',
    timeZone: 'Europe/Berlin',
    shiftPattern: { shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
    readIntervalHours: 4,
    defaultPaperSpeedMmPerS: 25,
    defaultGainMmPerMv: 10,
    idleLockMinutes: 5,
    policyOverrides: [],
    updatedAtMs: nowMs - 30 * 24 * hourMs,
  };
}

/** Counts for one strip: mostly sinus near 60-100 bpm, a few irregular, a few long QT. */
export function stripCounts(random: () => number): ReadCounts {
  const half = (v: number) => Math.max(0.5, Math.round(v * 2) / 2);
  const irregular = random() < 0.15;
  const rrBoxes = 15 + random() * 12;
  const rrSmallBoxes = Array.from({ length: irregular ? 4 : 2 }, () => half(rrBoxes * (1 + (irregular ? (random() - 0.5) * 0.4 : (random() - 0.5) * 0.05))));
  const counts: ReadCounts = {
    paperSpeedMmPerS: 25,
    gainMmPerMv: 10,
    rrSmallBoxes,
    ppSmallBoxes: [],
    qrsSmallBoxes: half(2 + random()),
    qtSmallBoxes: half(Math.min(9 + random() * 4, Math.min(...rrSmallBoxes) * 0.65)),
    rhythmLabel: irregular ? 'atrial-fibrillation' : 'sinus-rhythm',
    avBlockNoted: false,
  };
  if (!irregular) counts.prSmallBoxes = half(3.5 + random() * 2);
  return counts;
}

/** One bed with its stay and signed reads (oldest first). */
export interface BenchBed {
  bed: Bed;
  stay: Stay;
  reads: SignedRead[];
}

/** `bedCount` beds, each monitored for `days` days with a read every 4 h up to `nowMs`. */
export function benchWard(unit: Unit, bedCount: number, days: number, nowMs: number): BenchBed[] {
  const random = repeatableRandom(20_261_201 + bedCount * 31 + days);
  return Array.from({ length: bedCount }, (_, b) => {
    const id = String(b + 1).padStart(2, '0');
    const bed: Bed = { id: `bed-bench-${id}`, unitId: unit.id, label: `Bed ${b + 1}`, sortOrder: b, active: true };
    const startMs = nowMs - days * 24 * hourMs + Math.floor(random() * 60) * 60_000;
    const stay: Stay = {
      id: `stay-bench-${id}`,
      unitId: unit.id,
      bedId: bed.id,
      alias: `B${id}`,
      sex: random() < 0.5 ? 'female' : 'male',
      paced: false,
      bundleBranchBlock: false,
      qtProlongingDrugs: '',
      notes: '',
      startMs,
      endMs: null,
      updatedAtMs: startMs,
      updatedBy: 'Bench Nurse',
    };
    if (random() < 0.3) stay.baselineQtcMs = Math.round(400 + random() * 50);
    const reads: SignedRead[] = [];
    for (let t = startMs, i = 0; t <= nowMs - 20 * 60_000; t += 4 * hourMs, i += 1) {
      reads.push({
        id: `read-bench-${id}-${String(i).padStart(3, '0')}`,
        unitId: unit.id,
        bedId: bed.id,
        stayId: stay.id,
        stripTimeMs: t,
        enteredAtMs: t + 60_000,
        signedAtMs: t + 120_000,
        authorId: 'clin-bench-nurse',
        authorName: 'Bench Nurse',
        deviceId: 'tablet-bench',
        reason: 'routine',
        counts: stripCounts(random),
      });
    }
    return { bed, stay, reads };
  });
}
