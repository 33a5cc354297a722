import { analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import { readsToCsv } from '../../src/core/csv-export.ts';
import { readsToFhirBundle } from '../../src/core/fhir-export.ts';
import { summarizeHandover } from '../../src/core/handover-summary.ts';
import { readInputFor } from '../../src/core/read-derivation.ts';
import type { Amendment, ReadCounts, SignedRead, Stay, Unit } from '../../src/core/records.ts';
import type { ShiftInstance } from '../../src/core/shifts.ts';
import { shiftAt } from '../../src/core/shifts.ts';
import type { StayReads } from '../../src/core/stay-reads.ts';
import { defaultPolicy } from '../../src/core/unit-policy.ts';
import { formatCount, formatMicroseconds, formatRatio, formatTable, measureThroughput, repeatableRandom } from './bench-helpers.ts';
import { benchUnit } from './app-bench/bench-ward.ts';

// Handover summaries for a whole unit at one shift change: each bed's stay began a day before the
// shift, so a summary derives the day's q4h reads before the shift (for the last read before it and
// the schedule chain) and the shift's own reads, plus extra reads after alarms and a few amendments.
// Baseline in the same run: deriving the same reads (validation and analyzeRead) without summarising.

const hourMs = 3_600_000;
const generatorStart = 20_260_310;

const unit: Unit = { ...benchUnit(0), id: 'unit-bench-01', updatedAtMs: 0 };

/** Counts for one plausible strip: mostly sinus, some irregular, some wide QRS or long QT, at 25 mm/s with half-box resolution. */
function stripCounts(random: () => number): ReadCounts {
  const between = (min: number, max: number) => min + random() * (max - min);
  const toBoxes = (ms: number) => Math.max(0.5, Math.round((ms / 40) * 2) / 2);
  const irregular = random() < 0.15;
  const rateBpm = irregular ? between(70, 130) : between(55, 105);
  const meanRrMs = 60_000 / rateBpm;
  const rrSmallBoxes = Array.from({ length: irregular ? 5 : 2 + Math.floor(random() * 3) }, () => toBoxes(meanRrMs * (1 + (irregular ? between(-0.25, 0.25) : between(-0.03, 0.03)))));
  const qrsMs = random() < 0.15 ? between(120, 160) : between(70, 110);
  const qtMs = Math.min(between(380, 520) * Math.cbrt(meanRrMs / 1000), Math.min(...rrSmallBoxes) * 40 * 0.65);
  const counts: ReadCounts = {
    paperSpeedMmPerS: 25,
    gainMmPerMv: 10,
    rrSmallBoxes,
    ppSmallBoxes: [],
    qrsSmallBoxes: toBoxes(qrsMs),
    qtSmallBoxes: Math.max(toBoxes(qtMs), toBoxes(qrsMs) + 1),
    rhythmLabel: irregular ? 'atrial-fibrillation' : 'sinus-rhythm',
    avBlockNoted: false,
  };
  if (irregular) counts.sixSecondQrsCount = Math.round(rateBpm / 10);
  else counts.prSmallBoxes = toBoxes(between(120, 230));
  return counts;
}

/** Beds with a day of q4h reads before the shift, the shift's q4h reads, extra alarm reads on about a third, and some amendments. */
function generateBeds(bedCount: number, shift: ShiftInstance): StayReads[] {
  const random = repeatableRandom(generatorStart + bedCount);
  const beds: StayReads[] = [];
  for (let b = 0; b < bedCount; b += 1) {
    const stayStartMs = shift.startMs - 24 * hourMs + Math.floor(random() * 60) * 60_000;
    const stay: Stay = {
      id: `stay-bench-${String(b).padStart(4, '0')}`,
      unitId: unit.id,
      bedId: `bed-bench-${String(b).padStart(4, '0')}`,
      alias: `P${b}`,
      sex: random() < 0.5 ? 'female' : 'male',
      paced: false,
      bundleBranchBlock: false,
      qtProlongingDrugs: random() < 0.2 ? 'a QT-prolonging drug' : '',
      notes: '',
      startMs: stayStartMs,
      endMs: null,
      updatedAtMs: stayStartMs,
      updatedBy: 'bench',
    };
    if (random() < 0.3) stay.baselineQtcMs = Math.round(400 + random() * 60);
    const times: number[] = [];
    for (let t = stayStartMs; t < shift.endMs - 10 * 60_000; t += 4 * hourMs) times.push(t + Math.floor(random() * 40) * 60_000);
    if (random() < 0.35) times.push(shift.startMs + Math.floor(random() * 11 * 60) * 60_000);
    const reads: SignedRead[] = times.map((stripTimeMs, i) => ({
      id: `read-bench-${b}-${i}`,
      unitId: unit.id,
      bedId: stay.bedId,
      stayId: stay.id,
      stripTimeMs,
      enteredAtMs: stripTimeMs + 60_000,
      signedAtMs: stripTimeMs + 120_000,
      authorId: 'nurse-bench-01',
      authorName: 'Bench Nurse',
      deviceId: 'tablet-bench',
      reason: i === times.length - 1 && times.length > 9 ? 'alarm' : 'routine',
      counts: stripCounts(random),
      notes: random() < 0.05 ? 'Escalated to the on-call doctor' : undefined,
    }));
    const amendments: Amendment[] = [];
    if (random() < 0.1 && reads.length > 0) {
      const read = reads[reads.length - 1]!;
      amendments.push({ id: `amend-bench-${b}`, readId: read.id, unitId: unit.id, stayId: stay.id, changes: { notes: 'Recounted' }, reason: 'Recounted on the monitor', authorId: 'nurse-bench-01', authorName: 'Bench Nurse', deviceId: 'tablet-bench', createdAtMs: read.signedAtMs + 600_000 });
    }
    beds.push({ stay, bedLabel: `Bed ${b + 1}`, reads, amendments });
  }
  return beds;
}

/** Prints summaries per second and total time for a unit of 12, 24 and 48 beds at one 12 h shift change, against deriving the same reads alone. */
export async function run(): Promise<void> {
  const shift = shiftAt(Date.parse('2026-03-10T08:00:00Z'), unit.shiftPattern, unit.timeZone);
  const nowMs = shift.endMs - 10 * 60_000;
  console.log('Handover summaries: one 12 h day shift, each stay with a day of q4h reads before it, extra alarm reads and amendments');

  const rows: string[][] = [['beds', 'reads derived', 'summaries/s', 'all beds', 'baseline: derive only', 'ratio', 'growth vs 12 beds']];
  let twelveBedMs = 0;
  let fortyEight: StayReads[] = [];
  for (const bedCount of [12, 24, 48]) {
    const beds = generateBeds(bedCount, shift);
    if (bedCount === 48) fortyEight = beds;
    const readCount = beds.reduce((sum, bed) => sum + bed.reads.length, 0);
    const summaries = await measureThroughput(() => {
      let sink = 0;
      for (const bed of beds) sink += summarizeHandover({ unit, stay: bed.stay, bedLabel: bed.bedLabel, shift, reads: bed.reads, amendments: bed.amendments, nowMs }, defaultPolicy).assessment.length;
      return sink;
    }, bedCount, { rounds: 5 });
    const baseline = await measureThroughput(() => {
      let sink = 0;
      for (const bed of beds) {
        for (const read of bed.reads) {
          const result = analyzeUnknownRead(readInputFor(read.counts, bed.stay), defaultPolicy);
          sink += result.ok ? result.value.flags.length : 0;
        }
      }
      return sink;
    }, bedCount, { rounds: 5 });
    const totalMs = (summaries.microsecondsPerItem * bedCount) / 1000;
    const baselineMs = (baseline.microsecondsPerItem * bedCount) / 1000;
    if (bedCount === 12) twelveBedMs = totalMs;
    rows.push([
      String(bedCount),
      formatCount(readCount),
      formatCount(summaries.itemsPerSecond),
      `${totalMs.toFixed(2)} ms`,
      `${baselineMs.toFixed(2)} ms`,
      formatRatio(totalMs / baselineMs),
      formatRatio(totalMs / twelveBedMs),
    ]);
    console.log(`  ${bedCount} beds: ${formatMicroseconds(summaries.microsecondsPerItem)} per summary`);
  }
  console.log(formatTable(rows));

  // The same 48 beds exported for the shift, for scale beside the summaries.
  const exportRows: string[][] = [['48 beds, one shift', 'per export', 'reads']];
  const shiftReads = fortyEight.reduce((sum, bed) => sum + bed.reads.filter((r) => r.stripTimeMs >= shift.startMs && r.stripTimeMs < shift.endMs).length, 0);
  const fhir = await measureThroughput(() => readsToFhirBundle({ unit, stays: fortyEight, fromMs: shift.startMs, toMs: shift.endMs, exportedAtMs: nowMs }, defaultPolicy).bundle.entry.length, 1, { rounds: 5 });
  const csv = await measureThroughput(() => readsToCsv({ unit, stays: fortyEight, fromMs: shift.startMs, toMs: shift.endMs }, defaultPolicy).csv.length, 1, { rounds: 5 });
  exportRows.push(['FHIR R4 Bundle', `${(fhir.microsecondsPerItem / 1000).toFixed(2)} ms`, formatCount(shiftReads)]);
  exportRows.push(['CSV', `${(csv.microsecondsPerItem / 1000).toFixed(2)} ms`, formatCount(shiftReads)]);
  console.log(formatTable(exportRows));
}
