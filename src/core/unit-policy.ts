import type { QtcFormula } from './qtc.ts';

export type Severity = 'note' | 'caution' | 'urgent';

/** One configurable limit: its value, its severity when crossed, and where the default comes from. */
export interface Threshold {
  value: number;
  severity: Severity;
  source: string;
}

export const thresholdKeys = [
  'rateLowBpm',
  'rateHighBpm',
  'prShortMs',
  'prLongMs',
  'prMarkedMs',
  'qrsWideMs',
  'qtcProlongedMaleMs',
  'qtcProlongedFemaleMs',
  'qtcShortMs',
  'qtcHighRiskMs',
  'qtcRiseMs',
] as const;
export type ThresholdKey = (typeof thresholdKeys)[number];

/** How each limit compares: a value is flagged when `value <comparator> limit` holds. */
export const thresholdComparators: Record<ThresholdKey, '<' | '>' | '>=' | '<='> = {
  rateLowBpm: '<',
  rateHighBpm: '>',
  prShortMs: '<',
  prLongMs: '>',
  prMarkedMs: '>',
  qrsWideMs: '>=',
  qtcProlongedMaleMs: '>=',
  qtcProlongedFemaleMs: '>=',
  qtcShortMs: '<=',
  qtcHighRiskMs: '>=',
  qtcRiseMs: '>',
};

/** Plain-words label of each limit for settings screens and flag sentences. */
export const thresholdLabels: Record<ThresholdKey, string> = {
  rateLowBpm: 'Low heart rate',
  rateHighBpm: 'High heart rate',
  prShortMs: 'Short PR',
  prLongMs: 'Long PR (first-degree AV block range)',
  prMarkedMs: 'Markedly long PR',
  qrsWideMs: 'Wide QRS',
  qtcProlongedMaleMs: 'Prolonged QTc, male',
  qtcProlongedFemaleMs: 'Prolonged QTc, female',
  qtcShortMs: 'Short QTc',
  qtcHighRiskMs: 'High-risk QTc',
  qtcRiseMs: 'QTc rise',
};

export interface RegularityRule {
  /** R-R counts as regular when the longest minus the shortest is at most this many ms ... */
  maxSpreadMs: number;
  /** ... or at most this percentage of the mean R-R. */
  maxSpreadPercentOfMean: number;
  source: string;
}

export interface UnitPolicy {
  defaultQtcFormula: QtcFormula;
  thresholds: Record<ThresholdKey, Threshold>;
  regularity: RegularityRule;
}

/**
 * Default policy. Every value is a starting point that the unit's clinical lead may change.
 * Boundary decisions: QTc >= 500 ms is high risk (inclusive, as the AACN practice alert; Drew 2010
 * writes > 500, so exactly 500 ms is flagged on the side of safety); a QTc rise must exceed 60 ms.
 */
export const defaultPolicy: UnitPolicy = {
  defaultQtcFormula: 'fridericia',
  thresholds: {
    rateLowBpm: { value: 60, severity: 'caution', source: 'Classic adult sinus range 60-100 bpm (Spodick et al. 1992, Am J Cardiol 69:1245, on the 1928 NYHA criteria); a unit may choose 50 (Kusumoto et al. 2018 ACC/AHA/HRS bradycardia guideline)' },
    rateHighBpm: { value: 100, severity: 'caution', source: 'Classic adult sinus range 60-100 bpm (Spodick et al. 1992, Am J Cardiol 69:1245)' },
    prShortMs: { value: 120, severity: 'note', source: 'Normal adult PR 120-200 ms (StatPearls, Atrioventricular block; AACN Practice Alert 2016)' },
    prLongMs: { value: 200, severity: 'caution', source: 'PR > 200 ms is the first-degree AV block range (Kusumoto et al. 2018 ACC/AHA/HRS bradycardia guideline)' },
    prMarkedMs: { value: 300, severity: 'caution', source: 'PR > 300 ms: marked first-degree AV block (Medscape reference, a secondary source; common practice)' },
    qrsWideMs: { value: 120, severity: 'caution', source: 'QRS >= 120 ms meets the duration criterion for complete bundle-branch block (Surawicz et al. 2009, AHA/ACCF/HRS Part III)' },
    qtcProlongedMaleMs: { value: 450, severity: 'caution', source: 'Prolonged QTc >= 450 ms in men (Rautaharju et al. 2009, AHA/ACCF/HRS Part IV)' },
    qtcProlongedFemaleMs: { value: 460, severity: 'caution', source: 'Prolonged QTc >= 460 ms in women (Rautaharju et al. 2009, AHA/ACCF/HRS Part IV)' },
    qtcShortMs: { value: 390, severity: 'caution', source: 'Short QTc <= 390 ms (Rautaharju et al. 2009, AHA/ACCF/HRS Part IV)' },
    qtcHighRiskMs: { value: 500, severity: 'urgent', source: 'QTc of 500 ms or more: high torsade risk (Drew et al. 2010 AHA/ACCF statement, > 500 ms; AACN Practice Alert 2016, >= 500 ms; the app flags 500 itself)' },
    qtcRiseMs: { value: 60, severity: 'urgent', source: 'QTc rise > 60 ms: high torsade risk (Drew et al. 2010 AHA/ACCF statement, rise from the pre-drug baseline; the app applies the same limit to the change since the last read)' },
  },
  regularity: {
    maxSpreadMs: 80,
    maxSpreadPercentOfMean: 10,
    source: 'Common practice, no source: R-R regular when longest minus shortest is at most 2 small boxes (80 ms) or 10% of the mean',
  },
};

/** A unit's change to one default, with who made it, when and why (kept as history). */
export interface PolicyOverride {
  key: ThresholdKey | 'defaultQtcFormula' | 'regularityMaxSpreadMs' | 'regularityMaxSpreadPercentOfMean';
  value: number | QtcFormula;
  severity?: Severity;
  changedBy: string;
  changedAtMs: number;
  reason: string;
}

/** The policy in force after applying a unit's overrides in order (later changes win). */
export function applyPolicyOverrides(base: UnitPolicy, overrides: readonly PolicyOverride[]): UnitPolicy {
  const policy: UnitPolicy = {
    defaultQtcFormula: base.defaultQtcFormula,
    thresholds: { ...base.thresholds },
    regularity: { ...base.regularity },
  };
  for (const o of overrides) {
    const changedBy = `unit setting changed by ${o.changedBy}: ${o.reason}`;
    if (o.key === 'defaultQtcFormula') {
      policy.defaultQtcFormula = o.value as QtcFormula;
    } else if (o.key === 'regularityMaxSpreadMs') {
      policy.regularity = { ...policy.regularity, maxSpreadMs: o.value as number, source: changedBy };
    } else if (o.key === 'regularityMaxSpreadPercentOfMean') {
      policy.regularity = { ...policy.regularity, maxSpreadPercentOfMean: o.value as number, source: changedBy };
    } else {
      const before = policy.thresholds[o.key];
      policy.thresholds[o.key] = { value: o.value as number, severity: o.severity ?? before.severity, source: changedBy };
    }
  }
  return policy;
}
