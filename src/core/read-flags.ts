import { roundForDisplay } from './display-rounding.ts';
import type { PreviousFigures, Sex } from './read-input.ts';
import type { QtcFormula } from './qtc.ts';
import { qtcFormulaNames } from './qtc.ts';
import type { Severity, Threshold, ThresholdKey, UnitPolicy } from './unit-policy.ts';
import { thresholdComparators } from './unit-policy.ts';

/** The sentence every flag ends with: the app prompts, the unit's protocol decides. */
export const escalationCaution = "Verify on the monitor and follow your unit's escalation protocol.";

export type FlagCode =
  | 'rate-low'
  | 'rate-high'
  | 'rate-crossed-limit'
  | 'pr-short'
  | 'pr-long'
  | 'pr-marked'
  | 'pr-newly-long'
  | 'qrs-wide'
  | 'qrs-newly-wide'
  | 'qtc-prolonged'
  | 'qtc-short'
  | 'qtc-high-risk'
  | 'qtc-rise-from-baseline'
  | 'qtc-rise-since-last-read'
  | 'qtc-not-compared'
  | 'adult-thresholds';

/** A value that crossed a limit: what, by how much, against which limit from which source, and what to do. */
export interface Flag {
  code: FlagCode;
  severity: Severity;
  /** The figure in words, e.g. "QTc (Fridericia (1920))". */
  figure: string;
  /** Unrounded value the limit was compared with. */
  value: number;
  unit: 'ms' | 'bpm' | 'years';
  limit: { comparator: '<' | '>' | '>=' | '<='; value: number; key?: ThresholdKey };
  source: string;
  sentence: string;
}

const severityRank: Record<Severity, number> = { urgent: 0, caution: 1, note: 2 };

/** Orders flags most severe first; stable within a severity. */
export function sortFlagsBySeverity<T extends { severity: Severity }>(flags: readonly T[]): T[] {
  return [...flags].sort((a, b) => severityRank[a.severity] - severityRank[b.severity]);
}

function crosses(value: number, comparator: '<' | '>' | '>=' | '<=', limit: number): boolean {
  switch (comparator) {
    case '<':
      return value < limit;
    case '>':
      return value > limit;
    case '>=':
      return value >= limit;
    case '<=':
      return value <= limit;
  }
}

const comparatorWords: Record<'<' | '>' | '>=' | '<=', string> = {
  '<': 'below',
  '>': 'above',
  '>=': 'at or above',
  '<=': 'at or below',
};

function show(value: number, unit: string): string {
  return `${roundForDisplay(value)} ${unit}`;
}

/** Inputs the flag rules need, all derived by the core from the nurse's counts. */
export interface FlagContext {
  rateBpm: number | null;
  prMs: number | null;
  qrsMs: number | null;
  /** QTc that limits are compared with (plain, or wide-QRS adjusted), by the policy's default formula. */
  qtcMs: number | null;
  qtcFigure: string;
  qtcFormula: QtcFormula;
  sex: Sex;
  ageYears?: number | undefined;
  baselineQtcMs?: number | undefined;
  previous?: PreviousFigures | undefined;
}

function limitFlag(
  code: FlagCode,
  figure: string,
  value: number,
  unit: 'ms' | 'bpm',
  key: ThresholdKey,
  threshold: Threshold,
  meaning: string,
): Flag | null {
  const comparator = thresholdComparators[key];
  if (!crosses(value, comparator, threshold.value)) return null;
  return {
    code,
    severity: threshold.severity,
    figure,
    value,
    unit,
    limit: { comparator, value: threshold.value, key },
    source: threshold.source,
    sentence: `${figure} ${show(value, unit)} is ${comparatorWords[comparator]} the limit of ${threshold.value} ${unit}${meaning}. ${escalationCaution}`,
  };
}

/** The QTc limit for a patient: by sex where it differs; with sex not recorded the lower (male) limit is used, erring towards a flag. */
export function qtcProlongedThreshold(sex: Sex, policy: UnitPolicy): { key: ThresholdKey; threshold: Threshold } {
  const male = policy.thresholds.qtcProlongedMaleMs;
  const female = policy.thresholds.qtcProlongedFemaleMs;
  if (sex === 'female') return { key: 'qtcProlongedFemaleMs', threshold: female };
  if (sex === 'male') return { key: 'qtcProlongedMaleMs', threshold: male };
  return male.value <= female.value ? { key: 'qtcProlongedMaleMs', threshold: male } : { key: 'qtcProlongedFemaleMs', threshold: female };
}

/** All flags for one read: absolute limits first by figure, then change from baseline and from the last read. */
export function flagRead(ctx: FlagContext, policy: UnitPolicy): Flag[] {
  const t = policy.thresholds;
  const flags: Flag[] = [];
  const push = (f: Flag | null) => {
    if (f) flags.push(f);
  };

  if (ctx.ageYears !== undefined && ctx.ageYears < 16) {
    flags.push({
      code: 'adult-thresholds',
      severity: 'caution',
      figure: 'Age',
      value: ctx.ageYears,
      unit: 'years',
      limit: { comparator: '<', value: 16 },
      source: 'Adult limits; QRS and QTc limits differ in children (Surawicz et al. 2009 Part III; Rautaharju et al. 2009 Part IV)',
      sentence: `Age ${ctx.ageYears} years: these limits are for adults and do not apply under 16. ${escalationCaution}`,
    });
  }

  if (ctx.rateBpm !== null) {
    const low = limitFlag('rate-low', 'Heart rate', ctx.rateBpm, 'bpm', 'rateLowBpm', t.rateLowBpm, '');
    const high = limitFlag('rate-high', 'Heart rate', ctx.rateBpm, 'bpm', 'rateHighBpm', t.rateHighBpm, '');
    push(low);
    push(high);
    const prev = ctx.previous?.rateBpm;
    const prevInRange = prev !== undefined && prev >= t.rateLowBpm.value && prev <= t.rateHighBpm.value;
    if (prevInRange && (low || high)) {
      const crossed = (low ?? high)!;
      flags.push({
        ...crossed,
        code: 'rate-crossed-limit',
        severity: 'caution',
        sentence: `Heart rate has moved from ${show(prev, 'bpm')} at the last read to ${show(ctx.rateBpm, 'bpm')}, ${comparatorWords[crossed.limit.comparator]} the limit of ${crossed.limit.value} bpm. ${escalationCaution}`,
      });
    }
  }

  if (ctx.prMs !== null) {
    const marked = limitFlag('pr-marked', 'PR interval', ctx.prMs, 'ms', 'prMarkedMs', t.prMarkedMs, ' (markedly long)');
    push(marked ?? limitFlag('pr-long', 'PR interval', ctx.prMs, 'ms', 'prLongMs', t.prLongMs, ' (first-degree AV block range)'));
    push(limitFlag('pr-short', 'PR interval', ctx.prMs, 'ms', 'prShortMs', t.prShortMs, ' (short PR)'));
    const prev = ctx.previous?.prMs;
    if (prev !== undefined && prev <= t.prLongMs.value && ctx.prMs > t.prLongMs.value) {
      flags.push({
        code: 'pr-newly-long',
        severity: 'caution',
        figure: 'PR interval',
        value: ctx.prMs,
        unit: 'ms',
        limit: { comparator: '>', value: t.prLongMs.value, key: 'prLongMs' },
        source: t.prLongMs.source,
        sentence: `PR interval is newly above ${t.prLongMs.value} ms: ${show(prev, 'ms')} at the last read, ${show(ctx.prMs, 'ms')} now. ${escalationCaution}`,
      });
    }
  }

  if (ctx.qrsMs !== null) {
    push(limitFlag('qrs-wide', 'QRS duration', ctx.qrsMs, 'ms', 'qrsWideMs', t.qrsWideMs, ' (wide QRS)'));
    const prev = ctx.previous?.qrsMs;
    if (prev !== undefined && prev < t.qrsWideMs.value && ctx.qrsMs >= t.qrsWideMs.value) {
      flags.push({
        code: 'qrs-newly-wide',
        severity: 'caution',
        figure: 'QRS duration',
        value: ctx.qrsMs,
        unit: 'ms',
        limit: { comparator: '>=', value: t.qrsWideMs.value, key: 'qrsWideMs' },
        source: t.qrsWideMs.source,
        sentence: `QRS is newly ${t.qrsWideMs.value} ms or wider: ${show(prev, 'ms')} at the last read, ${show(ctx.qrsMs, 'ms')} now. ${escalationCaution}`,
      });
    }
  }

  if (ctx.qtcMs !== null) {
    const qtc = ctx.qtcMs;
    const highRisk = limitFlag('qtc-high-risk', ctx.qtcFigure, qtc, 'ms', 'qtcHighRiskMs', t.qtcHighRiskMs, ' (high torsade risk)');
    if (highRisk) {
      push(highRisk);
    } else {
      const { key, threshold } = qtcProlongedThreshold(ctx.sex, policy);
      const whose = ctx.sex === 'unknown' ? ' for a patient whose sex is not recorded (the lower limit is used)' : ` for a ${ctx.sex} patient`;
      push(limitFlag('qtc-prolonged', ctx.qtcFigure, qtc, 'ms', key, threshold, `${whose} (prolonged)`));
    }
    push(limitFlag('qtc-short', ctx.qtcFigure, qtc, 'ms', 'qtcShortMs', t.qtcShortMs, ' (short QTc)'));

    const rise = t.qtcRiseMs;
    // A rise flag: the change from an earlier QTc by the same formula, when it exceeds the rise limit.
    const riseFlag = (code: 'qtc-rise-from-baseline' | 'qtc-rise-since-last-read', fromMs: number, howWords: string): Flag => ({
      code,
      severity: rise.severity,
      figure: ctx.qtcFigure,
      value: qtc - fromMs,
      unit: 'ms',
      limit: { comparator: '>', value: rise.value, key: 'qtcRiseMs' },
      source: rise.source,
      sentence: `${ctx.qtcFigure} has risen ${show(qtc - fromMs, 'ms')} ${howWords}, more than ${rise.value} ms. ${escalationCaution}`,
    });
    if (ctx.baselineQtcMs !== undefined && qtc - ctx.baselineQtcMs > rise.value) {
      flags.push(riseFlag('qtc-rise-from-baseline', ctx.baselineQtcMs, `from the baseline of ${show(ctx.baselineQtcMs, 'ms')} to ${show(qtc, 'ms')}`));
    }
    const prev = ctx.previous;
    if (prev?.qtcMs !== undefined) {
      if (prev.qtcFormula !== undefined && prev.qtcFormula !== ctx.qtcFormula) {
        flags.push({
          code: 'qtc-not-compared',
          severity: 'note',
          figure: ctx.qtcFigure,
          value: qtc,
          unit: 'ms',
          limit: { comparator: '>', value: rise.value, key: 'qtcRiseMs' },
          source: 'Serial QTc should use the same correction formula each time (Sandau et al. 2017, from memory)',
          sentence: `The last read's QTc used ${qtcFormulaNames[prev.qtcFormula]}, this one ${qtcFormulaNames[ctx.qtcFormula]}: the change was not compared. Recalculate both with one formula before comparing.`,
        });
      } else if (qtc - prev.qtcMs > rise.value) {
        flags.push(riseFlag('qtc-rise-since-last-read', prev.qtcMs, `since the last read (${show(prev.qtcMs, 'ms')} to ${show(qtc, 'ms')})`));
      }
    }
  }
  return sortFlagsBySeverity(flags);
}
