import type { Sex } from '../core/read-input.ts';
import { qtcProlongedThreshold } from '../core/read-flags.ts';
import { qtcFormulaNames } from '../core/qtc.ts';
import type { ThresholdKey, UnitPolicy } from '../core/unit-policy.ts';
import { thresholdLabels } from '../core/unit-policy.ts';
import type { DerivedRead } from '../core/stay-reads.ts';

/** One figure across a stay's reads, with the unit policy's limits to draw as lines. */
export interface TrendSeries {
  key: 'rate' | 'pr' | 'qrs' | 'qtc';
  title: string;
  unit: 'bpm' | 'ms';
  points: Array<{ timeMs: number; value: number }>;
  limits: Array<{ value: number; label: string }>;
}

const limit = (policy: UnitPolicy, key: ThresholdKey) => ({ value: policy.thresholds[key].value, label: thresholdLabels[key] });

/** The four trends of a stay (rate, PR, QRS, QTc) from the core's derived figures; QTc by the unit's one formula, named. */
export function trendSeries(reads: readonly DerivedRead[], policy: UnitPolicy, sex: Sex): TrendSeries[] {
  const withAnalysis = reads.filter((r) => r.analysis !== null);
  const at = (r: DerivedRead) => r.view.current.stripTimeMs;
  const points = (pick: (r: DerivedRead) => number | null | undefined) =>
    withAnalysis.flatMap((r) => {
      const value = pick(r);
      return value === null || value === undefined ? [] : [{ timeMs: at(r), value }];
    });
  const formula = policy.defaultQtcFormula;
  const adjusted = withAnalysis.some((r) => r.analysis!.qtc?.forFlags.basis === 'modified-qt');
  const prolonged = qtcProlongedThreshold(sex, policy);
  return [
    { key: 'rate', title: 'Heart rate', unit: 'bpm', points: points((r) => r.analysis!.rate.rateBpm), limits: [limit(policy, 'rateLowBpm'), limit(policy, 'rateHighBpm')] },
    { key: 'pr', title: 'PR interval', unit: 'ms', points: points((r) => r.analysis!.intervals.prMs), limits: [limit(policy, 'prShortMs'), limit(policy, 'prLongMs')] },
    { key: 'qrs', title: 'QRS duration', unit: 'ms', points: points((r) => r.analysis!.intervals.qrsMs), limits: [limit(policy, 'qrsWideMs')] },
    {
      key: 'qtc',
      title: `QTc by ${qtcFormulaNames[formula]}${adjusted ? ', adjusted (QT − 0.5 × QRS) where QRS is wide or paced' : ''}`,
      unit: 'ms',
      points: points((r) => r.analysis!.qtc?.forFlags.qtcMs),
      limits: [limit(policy, 'qtcShortMs'), { value: prolonged.threshold.value, label: thresholdLabels[prolonged.key] }, limit(policy, 'qtcHighRiskMs')],
    },
  ];
}
