import type { ReadAnalysis } from './analyze-read.ts';
import { analyzeUnknownRead } from './analyze-read.ts';
import type { PreviousFigures, ReadInputDraft } from './read-input.ts';
import type { ParseResult } from './read-input.ts';
import type { AmendableFields, Amendment, ReadCounts, SignedRead, Stay } from './records.ts';
import type { UnitPolicy } from './unit-policy.ts';

/** The analysis input for a read: the nurse's counts plus what the stay knows (sex, age, pacing, baseline) and the last read's figures. */
export function readInputFor(counts: ReadCounts, stay: Pick<Stay, 'sex' | 'ageYears' | 'paced' | 'bundleBranchBlock' | 'baselineQtcMs'>, previous?: PreviousFigures): ReadInputDraft {
  const input: ReadInputDraft = {
    paperSpeedMmPerS: counts.paperSpeedMmPerS,
    gainMmPerMv: counts.gainMmPerMv,
    rrSmallBoxes: counts.rrSmallBoxes,
    ppSmallBoxes: counts.ppSmallBoxes,
    sex: stay.sex,
    paced: stay.paced,
    bundleBranchBlock: stay.bundleBranchBlock,
    avBlockNoted: counts.avBlockNoted,
  };
  if (counts.sixSecondQrsCount !== undefined) input.sixSecondQrsCount = counts.sixSecondQrsCount;
  if (counts.prSmallBoxes !== undefined) input.prSmallBoxes = counts.prSmallBoxes;
  if (counts.qrsSmallBoxes !== undefined) input.qrsSmallBoxes = counts.qrsSmallBoxes;
  if (counts.qtSmallBoxes !== undefined) input.qtSmallBoxes = counts.qtSmallBoxes;
  if (counts.rhythmLabel !== undefined) input.rhythmLabel = counts.rhythmLabel;
  if (stay.ageYears !== undefined) input.ageYears = stay.ageYears;
  if (stay.baselineQtcMs !== undefined) input.baselineQtcMs = stay.baselineQtcMs;
  if (previous !== undefined) input.previous = previous;
  return input;
}

/** The figures of an analysed read that the next read compares with. */
export function previousFiguresOf(analysis: ReadAnalysis): PreviousFigures {
  const figures: PreviousFigures = { rateBpm: analysis.rate.rateBpm };
  if (analysis.intervals.prMs !== null) figures.prMs = analysis.intervals.prMs;
  if (analysis.intervals.qrsMs !== null) figures.qrsMs = analysis.intervals.qrsMs;
  if (analysis.qtc) {
    figures.qtcMs = analysis.qtc.forFlags.qtcMs;
    figures.qtcFormula = analysis.qtc.defaultFormula;
  }
  return figures;
}

/** A signed read as it stands after its amendments (in the order given), with the history beside it. */
export interface ReadView {
  read: SignedRead;
  /** Counts and notes after every amendment. */
  current: SignedRead;
  amendments: Amendment[];
  changedFields: Array<keyof AmendableFields>;
}

/** Applies amendments in order to a signed read's copy; the original stays untouched. */
export function currentReadView(read: SignedRead, amendments: readonly Amendment[]): ReadView {
  const mine = amendments.filter((a) => a.readId === read.id).sort((a, b) => a.createdAtMs - b.createdAtMs || a.id.localeCompare(b.id));
  const current: SignedRead = { ...read, counts: { ...read.counts } };
  const changed = new Set<keyof AmendableFields>();
  for (const a of mine) {
    for (const [key, value] of Object.entries(a.changes) as Array<[keyof AmendableFields, unknown]>) {
      if (value === undefined) continue;
      changed.add(key);
      if (key === 'rhythmText' || key === 'ectopy' || key === 'notes') current[key] = value as string;
      else if (key === 'stripTimeMs') current.stripTimeMs = value as number;
      else (current.counts as Record<string, unknown>)[key] = value;
    }
  }
  return { read, current, amendments: mine, changedFields: [...changed] };
}

/** Derives a stored read's figures with this core, from its counts and its stay; the same call on tablet and server. */
export function deriveRead(read: SignedRead, stay: Stay, previous: PreviousFigures | undefined, policy: UnitPolicy): ParseResult<ReadAnalysis> {
  return analyzeUnknownRead(readInputFor(read.counts, stay, previous), policy);
}
