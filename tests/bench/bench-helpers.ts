import { performance } from 'node:perf_hooks';

/** Deterministic pseudo-random numbers in [0, 1) (mulberry32), so every run measures the same generated inputs. */
export function repeatableRandom(startValue: number): () => number {
  let state = startValue >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/** Median of a non-empty list (mean of the middle two for an even count). */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('median needs at least one value');
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

/** Where measured passes put their results so the engine cannot drop the work as unused. */
let resultSink = 0;
/** Reads the sink (print or compare it) so the accumulated work is observable. */
export function sinkValue(): number {
  return resultSink;
}

export interface ThroughputOptions {
  /** Rounds measured after the warm-up; the median is reported. */
  rounds?: number;
  /** Time spent running the pass before measuring, so the JIT has compiled the hot paths. */
  warmupMs?: number;
  /** Each round repeats the pass until it has run at least this long, so short passes are not lost in timer noise. */
  minRoundMs?: number;
}

export interface Throughput {
  itemsPerSecond: number;
  /** Median time for one item, in microseconds. */
  microsecondsPerItem: number;
  passesPerRound: number;
  roundsMs: number[];
}

/**
 * Measures how many items per second a pass handles: warms up, calibrates how many passes make a round,
 * then takes the median of several rounds. A pass returns a number that goes to the sink.
 */
export async function measureThroughput(pass: () => number | Promise<number>, itemsPerPass: number, options: ThroughputOptions = {}): Promise<Throughput> {
  const rounds = options.rounds ?? 7;
  const warmupMs = options.warmupMs ?? 500;
  const minRoundMs = options.minRoundMs ?? 200;

  let passes = 0;
  const warmupStart = performance.now();
  do {
    resultSink += await pass();
    passes += 1;
  } while (performance.now() - warmupStart < warmupMs);
  const msPerPass = (performance.now() - warmupStart) / passes;
  const passesPerRound = Math.max(1, Math.ceil(minRoundMs / Math.max(msPerPass, 1e-6)));

  const roundsMs: number[] = [];
  for (let r = 0; r < rounds; r += 1) {
    const start = performance.now();
    for (let p = 0; p < passesPerRound; p += 1) resultSink += await pass();
    roundsMs.push(performance.now() - start);
  }
  const msPerItem = median(roundsMs) / (passesPerRound * itemsPerPass);
  return { itemsPerSecond: 1000 / msPerItem, microsecondsPerItem: msPerItem * 1000, passesPerRound, roundsMs };
}

/** Whole numbers with thousands separators: 1234567 -> "1,234,567". */
export function formatCount(value: number): string {
  return Math.round(value).toLocaleString('en-GB');
}

/** A ratio to a baseline with sensible precision: 1.0x, 12.3x, 217x. */
export function formatRatio(ratio: number): string {
  return ratio >= 100 ? `${Math.round(ratio)}x` : `${ratio.toFixed(1)}x`;
}

/** Microseconds with three significant figures. */
export function formatMicroseconds(us: number): string {
  return `${us >= 100 ? Math.round(us) : us.toPrecision(3)} µs`;
}

/** Left-aligns the first cell and right-aligns the rest, for a small table of figures. */
export function formatTable(rows: readonly (readonly string[])[], indent = '  '): string {
  const widths = rows[0]!.map((_, i) => Math.max(...rows.map((r) => (r[i] ?? '').length)));
  return rows.map((r) => indent + r.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]!) : cell.padStart(widths[i]!))).join('   ').trimEnd()).join('\n');
}
