import { Window } from 'happy-dom';
import { Fragment, h, render } from 'preact';
import type { HandoverDeskData } from '../../src/app/handover-desk-data.ts';
import type { DeskRow } from '../../src/app/handover-desk-rows.ts';
import { handoverDeskRows, sortDeskRows } from '../../src/app/handover-desk-rows.ts';
import { DeskBedCard } from '../../src/app/screens/handover/DeskBedCard.tsx';
import type { Bed, ReadCounts, Stay, Unit } from '../../src/core/records.ts';
import type { ShiftInstance } from '../../src/core/shifts.ts';
import { shiftAt } from '../../src/core/shifts.ts';
import { defaultPolicy } from '../../src/core/unit-policy.ts';
import type { StoredAmendment, StoredHandover, StoredRead } from '../../src/store/db.ts';
import { formatRatio, formatTable, median, repeatableRandom } from './bench-helpers.ts';
import { benchUnit } from './app-bench/bench-ward.ts';

// The charge nurse's handover desk at 12, 24 and 48 beds (and 48 beds with a week of reads each):
// the rows (every bed's handover summary and 24 h trend, from the core) and the render of the bed
// cards into a DOM (happy-dom, Preact, the app's own DeskBedCard). Baseline in the same run: the
// same number of empty bed cards rendered the same way. Each figure is the median of several
// renders from scratch, as the desk renders when it opens.

const hourMs = 3_600_000;

const unit: Unit = { ...benchUnit(0), id: 'unit-bench-desk', updatedAtMs: 0 };

function counts(random: () => number): ReadCounts {
  const half = (v: number) => Math.round(v * 2) / 2;
  const rr = half(14 + random() * 12);
  return { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [rr, half(rr + random() - 0.5)], ppSmallBoxes: [], prSmallBoxes: half(3.5 + random() * 2.5), qrsSmallBoxes: half(2 + random() * 1.5), qtSmallBoxes: half(Math.min(rr * 0.6, 8.5 + random() * 4)), rhythmLabel: 'sinus-rhythm', avBlockNoted: false };
}

/** A unit of `bedCount` beds, each stay begun `days` days before the shift ended, q4h reads from three tablets, a few amendments and handovers. */
function generateUnit(bedCount: number, days: number, shift: ShiftInstance): HandoverDeskData {
  const random = repeatableRandom(20_260_310 + bedCount * 10 + days);
  const data: HandoverDeskData = { beds: [], stays: [], reads: [], amendments: [], handovers: [] };
  for (let b = 0; b < bedCount; b += 1) {
    const bed: Bed = { id: `bed-bench-${b}`, unitId: unit.id, label: `Bed ${b + 1}`, sortOrder: b, active: true };
    data.beds.push(bed);
    if (b % 12 === 11) continue; // about one bed in twelve stands empty
    const startMs = shift.endMs - days * 24 * hourMs + Math.floor(random() * 60) * 60_000;
    const stay: Stay = { id: `stay-bench-${b}`, unitId: unit.id, bedId: bed.id, alias: `P${b}`, sex: random() < 0.5 ? 'female' : 'male', paced: false, bundleBranchBlock: false, qtProlongingDrugs: '', notes: '', startMs, endMs: null, updatedAtMs: startMs, updatedBy: 'bench' };
    if (random() < 0.3) stay.baselineQtcMs = Math.round(400 + random() * 50);
    data.stays.push(stay);
    let i = 0;
    for (let t = startMs; t < shift.endMs - 30 * 60_000; t += 4 * hourMs + Math.floor(random() * 30) * 60_000) {
      const tablet = (b + i) % 3;
      data.reads.push({ id: `read-bench-${b}-${i}`, unitId: unit.id, bedId: bed.id, stayId: stay.id, stripTimeMs: t, enteredAtMs: t + 60_000, signedAtMs: t + 120_000, authorId: `nurse-${tablet}`, authorName: `Nurse ${tablet}`, deviceId: `tablet-${tablet}`, reason: 'routine', counts: counts(random), analysis: null, syncStatus: 'accepted' } satisfies StoredRead);
      i += 1;
    }
    const last = data.reads[data.reads.length - 1]!;
    if (random() < 0.1) data.amendments.push({ id: `amend-bench-${b}`, readId: last.id, unitId: unit.id, stayId: stay.id, changes: { notes: 'Recounted' }, reason: 'Recounted on the monitor', authorId: last.authorId, authorName: last.authorName, deviceId: last.deviceId, createdAtMs: last.signedAtMs + 600_000, syncStatus: 'accepted' } satisfies StoredAmendment);
    if (random() < 0.5) {
      data.handovers.push({ id: `handover-bench-${b}`, unitId: unit.id, stayId: stay.id, shiftKey: shift.key, nurseText: 'Stable.', givenById: 'nurse-0', givenByName: 'Nurse 0', givenAtMs: shift.endMs - 20 * 60_000, coveredRecordIds: [last.id], syncStatus: 'accepted' } satisfies StoredHandover);
    }
  }
  return data;
}

/** A DOM for Preact to render into, set up once: the app's components need `document` and `window`. */
function installDom(): HTMLElement {
  const window = new Window({ url: 'https://ward.example/' });
  Object.assign(globalThis, { window, document: window.document });
  const root = window.document.createElement('div');
  window.document.body.appendChild(root);
  return root as unknown as HTMLElement;
}

function renderCards(root: HTMLElement, rows: readonly DeskRow[], shiftKey: string, nowMs: number): number {
  render(h('ul', { class: 'desk-beds' }, rows.map((row) => h(DeskBedCard, { key: row.bed.id, row, timeZone: unit.timeZone, shiftKey, nowMs }))), root);
  const count = root.querySelectorAll('li').length;
  render(null, root);
  return count;
}

function medianMs(rounds: number, pass: () => number): number {
  const times: number[] = [];
  let sink = 0;
  for (let r = 0; r < rounds; r += 1) {
    const start = performance.now();
    sink += pass();
    times.push(performance.now() - start);
  }
  if (sink < 0) console.log(sink);
  return median(times);
}

/** Prints the desk's time to rows and to rendered cards at 12, 24 and 48 beds, against empty cards in the same DOM. */
export async function run(): Promise<void> {
  const shift = shiftAt(Date.parse('2026-03-10T17:00:00Z'), unit.shiftPattern, unit.timeZone);
  const nowMs = shift.endMs - 15 * 60_000;
  const root = installDom();
  console.log('Handover desk (unit view): summaries and 24 h trends per bed from the core, then the bed cards rendered (Preact into happy-dom)');
  const table: string[][] = [['beds x days', 'reads', 'rows (core)', 'render cards', 'desk total', 'baseline: empty cards', 'ratio', 'per bed']];
  for (const [bedCount, days] of [
    [12, 1],
    [24, 1],
    [48, 1],
    [48, 7],
  ] as const) {
    const data = generateUnit(bedCount, days, shift);
    const rows = sortDeskRows(handoverDeskRows({ unit, policy: defaultPolicy, data, shift, nowMs }), 'attention');
    const emptyRows: DeskRow[] = rows.map((row) => ({ ...row, stay: null, summary: null, trend: null, handover: null }));
    // Warm-up so the JIT has compiled both paths before anything is timed.
    for (let i = 0; i < 3; i += 1) {
      handoverDeskRows({ unit, policy: defaultPolicy, data, shift, nowMs });
      renderCards(root, rows, shift.key, nowMs);
      renderCards(root, emptyRows, shift.key, nowMs);
    }
    const rowsMs = medianMs(7, () => handoverDeskRows({ unit, policy: defaultPolicy, data, shift, nowMs }).length);
    const renderMs = medianMs(7, () => renderCards(root, rows, shift.key, nowMs));
    const emptyMs = medianMs(7, () => renderCards(root, emptyRows, shift.key, nowMs));
    const totalMs = rowsMs + renderMs;
    table.push([
      `${bedCount} x ${days}`,
      String(data.reads.length),
      `${rowsMs.toFixed(1)} ms`,
      `${renderMs.toFixed(1)} ms`,
      `${totalMs.toFixed(1)} ms`,
      `${emptyMs.toFixed(2)} ms`,
      formatRatio(renderMs / emptyMs),
      `${(totalMs / bedCount).toFixed(2)} ms`,
    ]);
  }
  console.log(formatTable(table));
  console.log('  ratio: rendering the full cards (trend plots, flags, status) against the same number of empty cards; rows are recomputed when the store or the clock changes.');
}
