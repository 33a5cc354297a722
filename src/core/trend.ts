import type { FieldError } from './field-error.ts';
import { ValidationError } from './field-error.ts';
import type { FlagCode } from './read-flags.ts';
import type { TrendFigure } from './flag-figure.ts';
import { figureOfFlag } from './flag-figure.ts';
import { qtcProlongedThreshold } from './read-flags.ts';
import type { QtcFormula } from './qtc.ts';
import { qtcFormulaNames } from './qtc.ts';
import type { Amendment, SignedRead, Stay } from './records.ts';
import { deriveStayReads } from './stay-reads.ts';
import type { Severity, ThresholdKey, UnitPolicy } from './unit-policy.ts';
import { thresholdComparators, thresholdLabels } from './unit-policy.ts';

// A patient's trend never mixes QTc formulas: the series uses the unit's default formula only and
// names it (same-method principle, clinical-reference §8 item 7). Points hold unrounded values; the
// plot or print rounds for display.

export type { TrendFigure } from './flag-figure.ts';

/** One read on a trend line. */
export interface TrendPoint {
  readId: string;
  stripTimeMs: number;
  value: number;
  /** Some flag on this read concerns this figure. */
  flagged: boolean;
  flagCodes: FlagCode[];
  /** QTc only: the correction is approximate (irregular R-R or R-R from a six-second count). */
  approximate?: boolean;
  /** QTc only: with wide QRS or pacing, the adjusted figure (QT - 0.5 x QRS, corrected) that limits were compared with. */
  adjustedForLimitsMs?: number;
}

/** A horizontal limit line drawn across a series. */
export interface ThresholdLine {
  key: ThresholdKey | 'baselineQtc';
  label: string;
  value: number;
  /** A value is flagged when `value <comparator> line`. */
  comparator: '<' | '>' | '>=' | '<=';
  severity: Severity | null;
  source: string;
}

/** One figure's points over time with its limit lines. */
export interface TrendSeries {
  figure: TrendFigure;
  label: string;
  unit: 'bpm' | 'ms';
  /** QTc only: the one formula every point uses. */
  formula?: QtcFormula;
  formulaName?: string;
  points: TrendPoint[];
  thresholds: ThresholdLine[];
}

/** The four trend series of one stay over [fromMs, toMs), and the reads that could not be plotted. */
export interface StayTrend {
  stayId: string;
  fromMs: number;
  toMs: number;
  rateBpm: TrendSeries;
  prMs: TrendSeries;
  qrsMs: TrendSeries;
  qtcMs: TrendSeries;
  /** Reads in the window whose counts could not be derived; none is dropped without a word. */
  problems: Array<{ readId: string; stripTimeMs: number; errors: FieldError[] }>;
}

function line(key: ThresholdKey, policy: UnitPolicy): ThresholdLine {
  const t = policy.thresholds[key];
  return { key, label: thresholdLabels[key], value: t.value, comparator: thresholdComparators[key], severity: t.severity, source: t.source };
}

/** Per-figure point series (rate, PR, QRS, QTc by the unit's default formula) with the unit's limit lines, for plots and print. */
export function trendSeries(
  reads: readonly SignedRead[],
  amendments: readonly Amendment[],
  stay: Stay,
  policy: UnitPolicy,
  fromMs: number,
  toMs: number,
): StayTrend {
  const errors: FieldError[] = [];
  if (!Number.isFinite(fromMs)) errors.push({ field: 'fromMs', message: 'fromMs must be a finite time in epoch milliseconds' });
  if (!Number.isFinite(toMs)) errors.push({ field: 'toMs', message: 'toMs must be a finite time in epoch milliseconds' });
  if (errors.length === 0 && toMs <= fromMs) errors.push({ field: 'toMs', message: 'toMs must be after fromMs' });
  if (errors.length > 0) throw new ValidationError(errors);

  const formula = policy.defaultQtcFormula;
  const series = (figure: TrendFigure, label: string, unit: 'bpm' | 'ms', thresholds: ThresholdLine[]): TrendSeries => ({ figure, label, unit, points: [], thresholds });
  const qtcLines = [line(qtcProlongedThreshold(stay.sex, policy).key, policy), line('qtcHighRiskMs', policy), line('qtcShortMs', policy)];
  if (stay.baselineQtcMs !== undefined) {
    const rise = policy.thresholds.qtcRiseMs;
    qtcLines.push(
      { key: 'baselineQtc', label: 'Baseline QTc', value: stay.baselineQtcMs, comparator: '>', severity: null, source: 'The baseline recorded for this stay' },
      { key: 'qtcRiseMs', label: `${thresholdLabels.qtcRiseMs} from baseline`, value: stay.baselineQtcMs + rise.value, comparator: '>', severity: rise.severity, source: rise.source },
    );
  }
  const trend: StayTrend = {
    stayId: stay.id,
    fromMs,
    toMs,
    rateBpm: series('rateBpm', 'Heart rate', 'bpm', [line('rateLowBpm', policy), line('rateHighBpm', policy)]),
    prMs: series('prMs', 'PR interval', 'ms', [line('prShortMs', policy), line('prLongMs', policy), line('prMarkedMs', policy)]),
    qrsMs: series('qrsMs', 'QRS duration', 'ms', [line('qrsWideMs', policy)]),
    qtcMs: { ...series('qtcMs', `QTc (${qtcFormulaNames[formula]})`, 'ms', qtcLines), formula, formulaName: qtcFormulaNames[formula] },
    problems: [],
  };

  for (const d of deriveStayReads(reads, amendments, stay, policy)) {
    if (d.stripTimeMs < fromMs || d.stripTimeMs >= toMs) continue;
    if (!d.analysis) {
      trend.problems.push({ readId: d.view.read.id, stripTimeMs: d.stripTimeMs, errors: d.errors });
      continue;
    }
    const a = d.analysis;
    const codesFor = (figure: TrendFigure) => a.flags.filter((f) => figureOfFlag(f.code) === figure).map((f) => f.code);
    const point = (figure: TrendFigure, value: number): TrendPoint => {
      const flagCodes = codesFor(figure);
      return { readId: d.view.read.id, stripTimeMs: d.stripTimeMs, value, flagged: flagCodes.length > 0, flagCodes };
    };
    trend.rateBpm.points.push(point('rateBpm', a.rate.rateBpm));
    if (a.intervals.prMs !== null) trend.prMs.points.push(point('prMs', a.intervals.prMs));
    if (a.intervals.qrsMs !== null) trend.qrsMs.points.push(point('qrsMs', a.intervals.qrsMs));
    if (a.qtc) {
      const p = point('qtcMs', a.qtc.byFormula[formula]);
      p.approximate = a.qtc.approximate;
      if (a.qtc.forFlags.basis === 'modified-qt') p.adjustedForLimitsMs = a.qtc.forFlags.qtcMs;
      trend.qtcMs.points.push(p);
    }
  }
  return trend;
}
