import { analyzeRead, analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import type { ReadInput, ReadInputDraft } from '../../src/core/read-input.ts';
import { parseReadInput } from '../../src/core/read-input.ts';
import type { RhythmLabelId } from '../../src/core/rhythm-labels.ts';
import { formatCount, formatMicroseconds, formatRatio, formatTable, measureThroughput, repeatableRandom } from './bench-helpers.ts';

const readCount = 10_000;
const generatorStart = 20_261_201;

type Kind = 'sinus' | 'bradycardia' | 'tachycardia' | 'atrial-fibrillation' | 'wide-qrs' | 'paced' | 'long-qt';

/** Share of each kind of strip among generated reads: mostly sinus, as on a ward, with every path of the core exercised. */
const kindWeights: Array<[Kind, number]> = [
  ['sinus', 0.45],
  ['bradycardia', 0.08],
  ['tachycardia', 0.12],
  ['atrial-fibrillation', 0.12],
  ['wide-qrs', 0.12],
  ['paced', 0.05],
  ['long-qt', 0.06],
];

const labelOf: Record<Kind, RhythmLabelId> = {
  sinus: 'sinus-rhythm',
  bradycardia: 'sinus-bradycardia',
  tachycardia: 'sinus-tachycardia',
  'atrial-fibrillation': 'atrial-fibrillation',
  'wide-qrs': 'sinus-rhythm',
  paced: 'paced-rhythm',
  'long-qt': 'sinus-rhythm',
};

/** Generates valid reads with realistic counts (half-box resolution), both paper speeds, one to eight R-R counts. */
export function generateReads(count: number, startValue: number): ReadInputDraft[] {
  const random = repeatableRandom(startValue);
  const between = (min: number, max: number) => min + random() * (max - min);
  const pick = (): Kind => {
    let x = random();
    for (const [kind, weight] of kindWeights) {
      if (x < weight) return kind;
      x -= weight;
    }
    return 'sinus';
  };
  const reads: ReadInputDraft[] = [];
  for (let i = 0; i < count; i += 1) {
    const kind = pick();
    const paperSpeedMmPerS = random() < 0.75 ? 25 : 50;
    const boxMs = 1000 / paperSpeedMmPerS;
    const toBoxes = (ms: number) => Math.max(0.5, Math.round((ms / boxMs) * 2) / 2);
    const rateBpm =
      kind === 'bradycardia' ? between(38, 58) : kind === 'tachycardia' ? between(102, 150) : kind === 'atrial-fibrillation' ? between(70, 140) : kind === 'paced' ? between(60, 80) : between(55, 98);
    const meanRrMs = 60_000 / rateBpm;
    const irregular = kind === 'atrial-fibrillation';
    const rrCount = irregular ? 4 + Math.floor(random() * 5) : 1 + Math.floor(random() * 4);
    const rrSmallBoxes = Array.from({ length: rrCount }, () => toBoxes(meanRrMs * (1 + (irregular ? between(-0.25, 0.25) : between(-0.03, 0.03)))));
    const shortestRrMs = Math.min(...rrSmallBoxes) * boxMs;
    const qrsMs = kind === 'wide-qrs' || kind === 'paced' ? between(120, 180) : between(70, 110);
    const qtcTargetMs = kind === 'long-qt' ? between(480, 560) : between(380, 470);
    const qtMs = Math.min(qtcTargetMs * Math.cbrt(meanRrMs / 1000), shortestRrMs * 0.65);
    const read: ReadInputDraft = {
      paperSpeedMmPerS,
      rrSmallBoxes,
      qrsSmallBoxes: toBoxes(qrsMs),
      qtSmallBoxes: Math.max(toBoxes(qtMs), toBoxes(qrsMs) + 1),
      sex: random() < 0.5 ? 'female' : 'male',
      ageYears: 20 + Math.floor(random() * 76),
      paced: kind === 'paced',
      bundleBranchBlock: kind === 'wide-qrs' && random() < 0.6,
      rhythmLabel: labelOf[kind],
    };
    if (irregular) read.sixSecondQrsCount = Math.round(rateBpm / 10);
    if (!irregular && kind !== 'paced') read.prSmallBoxes = toBoxes(between(120, 240));
    if (random() < 0.3) read.baselineQtcMs = Math.round(qtcTargetMs - between(0, 70));
    if (random() < 0.4) read.previous = { rateBpm: Math.round(rateBpm * between(0.9, 1.1)), qrsMs: Math.round(qrsMs), qtcMs: Math.round(qtcTargetMs - between(-20, 40)), qtcFormula: 'fridericia' };
    reads.push(read);
  }
  return reads;
}

/** Slots of the bare figures of one read. */
const slot = { rateBpm: 0, prMs: 1, qrsMs: 2, qtMs: 3, bazettMs: 4, fridericiaMs: 5, framinghamMs: 6, hodgesMs: 7 } as const;

/** One read's figures by bare arithmetic (boxes to ms, 60 000 / R-R, the four QTc formulas), NaN where the count is absent. */
function bareFigures(r: ReadInput, out: Float64Array): void {
  const boxMs = 1000 / r.paperSpeedMmPerS;
  let rrMs: number;
  if (r.rrSmallBoxes.length > 0) {
    let sumMs = 0;
    for (const boxes of r.rrSmallBoxes) sumMs += boxes * boxMs;
    rrMs = sumMs / r.rrSmallBoxes.length;
  } else {
    rrMs = 60_000 / (r.sixSecondQrsCount! * 10);
  }
  const rateBpm = 60_000 / rrMs;
  const rrS = rrMs / 1000;
  const qtMs = r.qtSmallBoxes === undefined ? Number.NaN : r.qtSmallBoxes * boxMs;
  out[slot.rateBpm] = rateBpm;
  out[slot.prMs] = r.prSmallBoxes === undefined ? Number.NaN : r.prSmallBoxes * boxMs;
  out[slot.qrsMs] = r.qrsSmallBoxes === undefined ? Number.NaN : r.qrsSmallBoxes * boxMs;
  out[slot.qtMs] = qtMs;
  out[slot.bazettMs] = qtMs / Math.sqrt(rrS);
  out[slot.fridericiaMs] = qtMs / Math.cbrt(rrS);
  out[slot.framinghamMs] = qtMs + 154 * (1 - rrS);
  out[slot.hodgesMs] = qtMs + 1.75 * (rateBpm - 60);
}

/** The baseline pass: bare figures for every read, summed so the work cannot be dropped. */
function bareArithmetic(reads: readonly ReadInput[], out: Float64Array): number {
  let total = 0;
  for (const r of reads) {
    bareFigures(r, out);
    total += out[slot.rateBpm]! + out[slot.fridericiaMs]!;
  }
  return total;
}

/** The largest difference, over every read, between the core's figures and the bare arithmetic (so the bench compares like with like). */
function largestDisagreement(reads: readonly ReadInput[]): number {
  const out = new Float64Array(8);
  let largest = 0;
  const compare = (core: number | null, bare: number) => {
    if (core === null) {
      if (!Number.isNaN(bare)) largest = Number.POSITIVE_INFINITY;
      return;
    }
    largest = Math.max(largest, Math.abs(core - bare));
  };
  for (const input of reads) {
    const a = analyzeRead(input);
    bareFigures(input, out);
    // With irregular R-R the core reports the six-second rate; the bare rate is always from the mean R-R.
    if (!(a.rate.method === 'six-second' && input.rrSmallBoxes.length > 0)) compare(a.rate.rateBpm, out[slot.rateBpm]!);
    compare(a.intervals.prMs, out[slot.prMs]!);
    compare(a.intervals.qrsMs, out[slot.qrsMs]!);
    compare(a.intervals.qtMs, out[slot.qtMs]!);
    if (a.qtc) {
      compare(a.qtc.byFormula.bazett, out[slot.bazettMs]!);
      compare(a.qtc.byFormula.fridericia, out[slot.fridericiaMs]!);
      compare(a.qtc.byFormula.framingham, out[slot.framinghamMs]!);
      compare(a.qtc.byFormula.hodges, out[slot.hodgesMs]!);
    }
  }
  return largest;
}

/** Benchmarks the computation core against bare formula arithmetic on the same 10,000 reads. */
export async function run(): Promise<void> {
  const drafts = generateReads(readCount, generatorStart);
  const parsed: ReadInput[] = drafts.map((draft, i) => {
    const result = parseReadInput(draft);
    if (!result.ok) throw new Error(`generated read ${i} is invalid: ${result.errors.map((e) => e.message).join('; ')}`);
    return result.value;
  });

  const disagreementMs = largestDisagreement(parsed);
  if (!(disagreementMs < 1e-6)) throw new Error(`the core and the bare arithmetic disagree by up to ${disagreementMs} on the same reads`);

  const share = (test: (r: ReadInput) => boolean) => `${Math.round((parsed.filter(test).length / parsed.length) * 100)}%`;
  console.log(
    `core: ${formatCount(readCount)} generated reads (generator start ${generatorStart}): 50 mm/s ${share((r) => r.paperSpeedMmPerS === 50)}, ` +
      `several R-R ${share((r) => r.rrSmallBoxes.length > 1)}, wide QRS ${share((r) => (r.qrsSmallBoxes ?? 0) * (1000 / r.paperSpeedMmPerS) >= 120)}, ` +
      `six-second count ${share((r) => r.sixSecondQrsCount !== undefined)}, with a previous read ${share((r) => r.previous !== undefined)}`,
  );

  const out = new Float64Array(8);
  const baseline = await measureThroughput(() => bareArithmetic(parsed, out), parsed.length);
  const analysisOnly = await measureThroughput(() => {
    let total = 0;
    for (const input of parsed) total += analyzeRead(input).flags.length;
    return total;
  }, parsed.length);
  const validated = await measureThroughput(() => {
    let total = 0;
    for (const draft of drafts) {
      const result = analyzeUnknownRead(draft);
      total += result.ok ? result.value.flags.length : -1;
    }
    return total;
  }, drafts.length);

  const row = (label: string, t: typeof baseline) => [label, `${formatCount(t.itemsPerSecond)} reads/s`, formatMicroseconds(t.microsecondsPerItem), `${formatRatio(baseline.itemsPerSecond / t.itemsPerSecond)} baseline time`];
  console.log(
    formatTable([
      row('bare formula arithmetic (baseline)', baseline),
      row('analyzeRead (analysis only)', analysisOnly),
      row('analyzeUnknownRead (validation + analysis)', validated),
    ]),
  );
  console.log(`  median of 7 rounds after a 0.5 s warm-up; core and bare arithmetic agree ${disagreementMs === 0 ? 'exactly' : `within ${disagreementMs.toExponential(1)}`} on every read`);
}
