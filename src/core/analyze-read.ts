import { smallBoxMs, smallBoxesToMs } from './boxes-to-ms.ts';
import { coreVersion } from './core-version.ts';
import { ValidationError } from './field-error.ts';
import { rateFromSixSecondCount, rrMsFromRate } from './heart-rate.ts';
import type { Flag } from './read-flags.ts';
import { flagRead } from './read-flags.ts';
import type { ParseResult, PolicyInput, ReadInput } from './read-input.ts';
import { parseReadInput } from './read-input.ts';
import type { QtcFormula } from './qtc.ts';
import { bogossianModifiedQtMs, correctQt, correctQtAllFormulas, jtMs, qtcFormulaNames, qtcFormulaShortNames, qtcFormulas } from './qtc.ts';
import type { RhythmQuestion } from './rhythm-questions.ts';
import { rhythmQuestions } from './rhythm-questions.ts';
import type { IntervalSeriesSummary, Regularity } from './rr-summary.ts';
import { summarizeIntervals } from './rr-summary.ts';
import type { UnitPolicy } from './unit-policy.ts';
import { defaultPolicy } from './unit-policy.ts';

export type RateMethod = 'single-rr' | 'mean-rr' | 'six-second';

export interface RateResult {
  /** The ventricular rate the read reports. */
  rateBpm: number;
  method: RateMethod;
  /** How the rate was found, in words for the screen and the record. */
  methodDescription: string;
  rr: IntervalSeriesSummary | null;
  sixSecondRateBpm: number | null;
  regularity: Regularity;
}

export interface QtcWarning {
  code: 'irregular-rr' | 'rr-from-six-second-count' | 'rate-outside-formula-range' | 'bazett-fast-rate' | 'wide-qrs' | 'paced' | 'bundle-branch-block-no-qrs';
  message: string;
}

export interface WideQrsAdjustment {
  qrsMs: number;
  jtMs: number;
  jtcMs: number;
  /** Bogossian simplified modified QT: QT - 0.5 x QRS. */
  modifiedQtMs: number;
  modifiedQtcMs: number;
  formula: QtcFormula;
}

export interface QtcResult {
  qtMs: number;
  rrUsedMs: number;
  rrUsedDescription: string;
  approximate: boolean;
  defaultFormula: QtcFormula;
  byFormula: Record<QtcFormula, number>;
  /** Every formula, the unit's default first. */
  ordered: Array<{ formula: QtcFormula; name: string; qtcMs: number; isDefault: boolean }>;
  warnings: QtcWarning[];
  wideQrs: WideQrsAdjustment | null;
  /** The value limits are compared with, and why that one. */
  forFlags: { qtcMs: number; figure: string; basis: 'plain' | 'modified-qt' };
}

export interface ReadAnalysis {
  coreVersion: string;
  paperSpeedMmPerS: number;
  gainMmPerMv: number;
  smallBoxMs: number;
  rate: RateResult;
  atrialRate: IntervalSeriesSummary | null;
  intervals: { prMs: number | null; qrsMs: number | null; qtMs: number | null };
  qtc: QtcResult | null;
  flags: Flag[];
  questions: RhythmQuestion[];
  defaultQtcFormula: QtcFormula;
}

/** Where a formula's correction is reasonably trusted, in bpm. Framingham: the derivation range (Sagie 1992). Others: common practice, no source. */
const formulaRateRangeBpm: Record<QtcFormula, { min: number; max: number; source: string }> = {
  bazett: { min: 50, max: 120, source: 'common practice, no source' },
  fridericia: { min: 50, max: 120, source: 'common practice, no source' },
  framingham: { min: 41, max: 120, source: 'derivation range of Sagie et al. 1992' },
  hodges: { min: 50, max: 120, source: 'common practice, no source' },
};

/** Bazett over-corrects at faster rates (Rautaharju et al. 2009 Part IV, summaries quote > ~85 bpm). */
const bazettOverCorrectsAboveBpm = 85;

/** Applies a read's simple policy overrides on top of the unit policy. */
export function withPolicyInput(policy: UnitPolicy, overrides: PolicyInput | undefined): UnitPolicy {
  if (!overrides) return policy;
  const thresholds = { ...policy.thresholds };
  for (const [key, value] of Object.entries(overrides.thresholds ?? {}) as Array<[keyof typeof thresholds, number]>) {
    thresholds[key] = { ...thresholds[key], value, source: `${thresholds[key].source}; overridden for this read to ${value}` };
  }
  return {
    defaultQtcFormula: overrides.defaultQtcFormula ?? policy.defaultQtcFormula,
    thresholds,
    regularity: {
      ...policy.regularity,
      maxSpreadMs: overrides.regularityMaxSpreadMs ?? policy.regularity.maxSpreadMs,
      maxSpreadPercentOfMean: overrides.regularityMaxSpreadPercentOfMean ?? policy.regularity.maxSpreadPercentOfMean,
    },
  };
}

function rateOf(input: ReadInput, policy: UnitPolicy): RateResult {
  const speed = input.paperSpeedMmPerS;
  const rr = input.rrSmallBoxes.length > 0 ? summarizeIntervals(input.rrSmallBoxes, speed, policy.regularity) : null;
  const sixSecondRateBpm = input.sixSecondQrsCount === undefined ? null : rateFromSixSecondCount(input.sixSecondQrsCount);
  const regularity = rr?.regularity ?? 'unknown';
  if (rr && !(regularity === 'irregular' && sixSecondRateBpm !== null)) {
    if (rr.intervalsMs.length === 1) {
      const rule = speed === 25 ? '1500' : '3000';
      return { rateBpm: rr.meanRateBpm, method: 'single-rr', methodDescription: `One R-R of ${input.rrSmallBoxes[0]} small boxes at ${speed} mm/s (${rule} / small boxes)`, rr, sixSecondRateBpm, regularity };
    }
    const irregularNote = regularity === 'irregular' ? '; R-R is irregular, so a six-second count over the strip is more representative' : '';
    return { rateBpm: rr.meanRateBpm, method: 'mean-rr', methodDescription: `Mean of ${rr.intervalsMs.length} R-R intervals at ${speed} mm/s${irregularNote}`, rr, sixSecondRateBpm, regularity };
  }
  const count = input.sixSecondQrsCount!;
  const why = regularity === 'irregular' ? ' (R-R irregular, so the six-second count is used)' : '';
  return { rateBpm: sixSecondRateBpm!, method: 'six-second', methodDescription: `${count} QRS complexes in 6 seconds x 10${why}`, rr, sixSecondRateBpm, regularity };
}

function qtcOf(input: ReadInput, rate: RateResult, qtMs: number, qrsMs: number | null, policy: UnitPolicy): QtcResult {
  const formula = policy.defaultQtcFormula;
  const warnings: QtcWarning[] = [];
  let rrUsedMs: number;
  let rrUsedDescription: string;
  let approximate = false;
  if (rate.rr) {
    rrUsedMs = rate.rr.meanMs;
    rrUsedDescription = rate.rr.intervalsMs.length === 1 ? `the R-R entered (${Math.round(rrUsedMs)} ms)` : `the mean of ${rate.rr.intervalsMs.length} R-R intervals (${Math.round(rrUsedMs)} ms)`;
    if (rate.regularity === 'irregular') {
      approximate = true;
      warnings.push({ code: 'irregular-rr', message: `R-R is irregular: QTc uses the mean R-R and is approximate. Rate correction is unreliable when R-R varies widely (Rautaharju et al. 2009 Part IV); average several beats (Al-Khatib et al. 2003).` });
    }
  } else {
    rrUsedMs = rrMsFromRate(rate.rateBpm);
    rrUsedDescription = `R-R derived from the six-second count (${Math.round(rrUsedMs)} ms)`;
    approximate = true;
    warnings.push({ code: 'rr-from-six-second-count', message: 'No R-R was counted: QTc uses an R-R derived from the six-second rate and is approximate. Count the R-R before the measured QT where you can.' });
  }
  const rrRateBpm = 60_000 / rrUsedMs;
  const range = formulaRateRangeBpm[formula];
  if (rrRateBpm < range.min || rrRateBpm > range.max) {
    warnings.push({ code: 'rate-outside-formula-range', message: `At ${Math.round(rrRateBpm)} bpm the ${qtcFormulaNames[formula]} correction is less reliable (trusted about ${range.min}-${range.max} bpm, ${range.source}).` });
  }
  if (formula === 'bazett' && rrRateBpm > bazettOverCorrectsAboveBpm) {
    warnings.push({ code: 'bazett-fast-rate', message: `Bazett over-corrects above about ${bazettOverCorrectsAboveBpm} bpm (Rautaharju et al. 2009 Part IV); compare with Fridericia.` });
  }
  const byFormula = correctQtAllFormulas(qtMs, rrUsedMs);
  const ordered = [formula, ...qtcFormulas.filter((f) => f !== formula)].map((f) => ({ formula: f, name: qtcFormulaNames[f], qtcMs: byFormula[f], isDefault: f === formula }));

  const wide = qrsMs !== null && qrsMs >= policy.thresholds.qrsWideMs.value;
  let wideQrs: WideQrsAdjustment | null = null;
  if (qrsMs !== null && (wide || input.paced || input.bundleBranchBlock)) {
    const modifiedQt = bogossianModifiedQtMs(qtMs, qrsMs);
    const jt = jtMs(qtMs, qrsMs);
    wideQrs = { qrsMs, jtMs: jt, jtcMs: correctQt(formula, jt, rrUsedMs), modifiedQtMs: modifiedQt, modifiedQtcMs: correctQt(formula, modifiedQt, rrUsedMs), formula };
  }
  if (wide) {
    warnings.push({ code: 'wide-qrs', message: `QRS ${Math.round(qrsMs!)} ms is wide: the QT includes the wide QRS. Limits are compared with QT - 0.5 x QRS corrected by ${qtcFormulaNames[formula]} (Bogossian et al. 2014); JT and JTc are shown too.` });
  }
  if (input.paced) {
    warnings.push({ code: 'paced', message: 'Paced rhythm: no QTc formula is validated for ward use; interpret with caution (Bogossian et al. 2014, 2020).' });
  }
  if (input.bundleBranchBlock && qrsMs === null) {
    warnings.push({ code: 'bundle-branch-block-no-qrs', message: 'Bundle-branch block is recorded but no QRS was counted: count the QRS so the QTc can be adjusted for it.' });
  }
  const useModified = wideQrs !== null && (wide || input.paced);
  const forFlags = useModified
    ? { qtcMs: wideQrs!.modifiedQtcMs, figure: `Adjusted QTc (QT - 0.5 x QRS, ${qtcFormulaShortNames[formula]})`, basis: 'modified-qt' as const }
    : { qtcMs: byFormula[formula], figure: `QTc (${qtcFormulaShortNames[formula]})`, basis: 'plain' as const };
  return { qtMs, rrUsedMs, rrUsedDescription, approximate, defaultFormula: formula, byFormula, ordered, warnings, wideQrs, forFlags };
}

/** Every derived figure, flag and question for one validated read. Pure: the same input always gives the same analysis. */
export function analyzeRead(input: ReadInput, unitPolicy: UnitPolicy = defaultPolicy): ReadAnalysis {
  const policy = withPolicyInput(unitPolicy, input.policy);
  const speed = input.paperSpeedMmPerS;
  const rate = rateOf(input, policy);
  const atrialRate = input.ppSmallBoxes.length > 0 ? summarizeIntervals(input.ppSmallBoxes, speed, policy.regularity) : null;
  const toMs = (boxes: number | undefined) => (boxes === undefined ? null : smallBoxesToMs(boxes, speed));
  const intervals = { prMs: toMs(input.prSmallBoxes), qrsMs: toMs(input.qrsSmallBoxes), qtMs: toMs(input.qtSmallBoxes) };
  const qtc = intervals.qtMs === null ? null : qtcOf(input, rate, intervals.qtMs, intervals.qrsMs, policy);
  const flags = flagRead(
    {
      rateBpm: rate.rateBpm,
      prMs: intervals.prMs,
      qrsMs: intervals.qrsMs,
      qtcMs: qtc?.forFlags.qtcMs ?? null,
      qtcFigure: qtc?.forFlags.figure ?? 'QTc',
      qtcFormula: policy.defaultQtcFormula,
      sex: input.sex,
      ageYears: input.ageYears,
      baselineQtcMs: input.baselineQtcMs,
      previous: input.previous,
    },
    policy,
  );
  const questions = input.rhythmLabel
    ? rhythmQuestions(
        {
          rhythmLabel: input.rhythmLabel,
          rateBpm: rate.rateBpm,
          regularity: rate.regularity,
          rrCount: rate.rr?.intervalsMs.length ?? 0,
          rrSpreadMs: rate.rr?.spreadMs ?? null,
          prMs: intervals.prMs,
          qrsMs: intervals.qrsMs,
          atrialRateBpm: atrialRate?.meanRateBpm ?? null,
          paced: input.paced,
          avBlockNoted: input.avBlockNoted,
        },
        policy,
      )
    : [];
  return { coreVersion, paperSpeedMmPerS: speed, gainMmPerMv: input.gainMmPerMv, smallBoxMs: smallBoxMs(speed), rate, atrialRate, intervals, qtc, flags, questions, defaultQtcFormula: policy.defaultQtcFormula };
}

/** Validates unknown input and analyses it; bad input comes back as field-named errors, never as an exception. */
export function analyzeUnknownRead(raw: unknown, unitPolicy: UnitPolicy = defaultPolicy): ParseResult<ReadAnalysis> {
  const parsed = parseReadInput(raw);
  if (!parsed.ok) return parsed;
  return { ok: true, value: analyzeRead(parsed.value, unitPolicy) };
}

/** Validates and analyses, throwing a ValidationError for bad input (for callers that convert errors at their edge). */
export function analyzeReadOrThrow(raw: unknown, unitPolicy: UnitPolicy = defaultPolicy): ReadAnalysis {
  const result = analyzeUnknownRead(raw, unitPolicy);
  if (!result.ok) throw new ValidationError(result.errors);
  return result.value;
}
