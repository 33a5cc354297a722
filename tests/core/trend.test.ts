import { describe, expect, it } from 'vitest';
import { trendSeries } from '../../src/core/trend.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../src/core/unit-policy.ts';
import { at, counts, makeAmendment, makeRead, makeStay } from './fixtures/ward-reads.ts';

const stay = makeStay({ baselineQtcMs: 430 });
const reads = [
  makeRead('read-trend-01', '2026-03-10T02:00:00Z', counts.exampleA),
  makeRead('read-trend-02', '2026-03-10T06:00:00Z', counts.exampleF),
  makeRead('read-trend-03', '2026-03-10T10:00:00Z', counts.wideQrsExampleI),
  makeRead('read-trend-04', '2026-03-10T14:00:00Z', counts.noQt),
  makeRead('read-trend-05', '2026-03-10T18:00:00Z', counts.exampleA),
];
const fromMs = at('2026-03-10T06:00:00Z');
const toMs = at('2026-03-10T18:00:00Z');

describe('trend series over one shift', () => {
  const trend = trendSeries(reads, [], stay, defaultPolicy, fromMs, toMs);

  it('takes the reads from the start (inclusive) to the end (exclusive), in strip-time order', () => {
    expect(trend.rateBpm.points.map((p) => p.readId)).toEqual(['read-trend-02', 'read-trend-03', 'read-trend-04']);
  });

  it('gives rate points from the counts: 75 bpm at R-R 800 ms, 71.43 bpm at 840 ms (clinical-reference §4a heart-rate examples)', () => {
    expect(trend.rateBpm.points.map((p) => p.value)).toEqual([75, 75, 60_000 / 840]);
    expect(trend.rateBpm.unit).toBe('bpm');
  });

  it('plots QTc by the unit formula only, named, and skips reads with no QT', () => {
    expect(trend.qtcMs.formula).toBe('fridericia');
    expect(trend.qtcMs.label).toBe('QTc (Fridericia (1920))');
    // Ex F: Fridericia 560.15; Ex I plain Fridericia 480 / 0.8^(1/3) = 517.06 (clinical-reference §4a).
    expect(trend.qtcMs.points.map((p) => p.readId)).toEqual(['read-trend-02', 'read-trend-03']);
    expect(trend.qtcMs.points[0]?.value).toBeCloseTo(560.15, 2);
    expect(trend.qtcMs.points[1]?.value).toBeCloseTo(517.06, 2);
  });

  it('marks the wide-QRS point with the adjusted figure its limits used (QT - 0.5 x QRS, Fridericia 430.89; Bogossian et al. 2014)', () => {
    const wide = trend.qtcMs.points[1]!;
    expect(wide.adjustedForLimitsMs).toBeCloseTo(430.89, 2);
    expect(wide.flagged).toBe(false);
    expect(trend.qrsMs.points[1]).toMatchObject({ value: 160, flagged: true, flagCodes: ['qrs-wide', 'qrs-newly-wide'] });
  });

  it('marks flagged QTc points with their codes: 560 ms is high risk (>= 500, Drew et al. 2010; AACN 2016)', () => {
    expect(trend.qtcMs.points[0]).toMatchObject({ flagged: true, approximate: false });
    expect(trend.qtcMs.points[0]?.flagCodes).toEqual(['qtc-high-risk', 'qtc-rise-from-baseline', 'qtc-rise-since-last-read']);
  });

  it('draws the unit limits, the female QTc limit and the baseline rise line (Rautaharju et al. 2009; Drew et al. 2010)', () => {
    expect(trend.rateBpm.thresholds.map((t) => [t.key, t.comparator, t.value])).toEqual([
      ['rateLowBpm', '<', 60],
      ['rateHighBpm', '>', 100],
    ]);
    expect(trend.qtcMs.thresholds.map((t) => [t.key, t.value])).toEqual([
      ['qtcProlongedFemaleMs', 460],
      ['qtcHighRiskMs', 500],
      ['qtcShortMs', 390],
      ['baselineQtc', 430],
      ['qtcRiseMs', 490],
    ]);
    expect(trend.qrsMs.thresholds.map((t) => [t.key, t.comparator, t.value])).toEqual([['qrsWideMs', '>=', 120]]);
  });

  it('uses the lower QTc limit when sex is not recorded', () => {
    const unknown = trendSeries(reads, [], makeStay({ sex: 'unknown' }), defaultPolicy, fromMs, toMs);
    expect(unknown.qtcMs.thresholds[0]).toMatchObject({ key: 'qtcProlongedMaleMs', value: 450 });
    expect(unknown.qtcMs.thresholds.some((t) => t.key === 'baselineQtc')).toBe(false);
  });
});

describe('trend series follow the unit policy and the amendments', () => {
  it('switches every point to the unit formula when the policy changes (Bazett: Ex F 581.38 ms)', () => {
    const bazett = applyPolicyOverrides(defaultPolicy, [{ key: 'defaultQtcFormula', value: 'bazett', changedBy: 'Dr A.B.', changedAtMs: 0, reason: 'unit protocol' }]);
    const trend = trendSeries(reads, [], stay, bazett, fromMs, toMs);
    expect(trend.qtcMs.formula).toBe('bazett');
    expect(trend.qtcMs.points[0]?.value).toBeCloseTo(581.38, 2);
  });

  it('plots the amended counts, and moves a read whose strip time was amended', () => {
    const amendments = [
      makeAmendment('amend-trend-1', 'read-trend-02', '2026-03-10T07:00:00Z', { qtSmallBoxes: 10 }, 'QT recounted'),
      makeAmendment('amend-trend-2', 'read-trend-05', '2026-03-10T19:00:00Z', { stripTimeMs: at('2026-03-10T17:00:00Z') }, 'Strip time corrected'),
    ];
    const trend = trendSeries(reads, amendments, stay, defaultPolicy, fromMs, toMs);
    // QT 400 ms at R-R 800 ms: Fridericia 430.89 (clinical-reference §4a wide-QRS Ex I uses the same QT and R-R).
    expect(trend.qtcMs.points[0]?.value).toBeCloseTo(430.89, 2);
    expect(trend.rateBpm.points.map((p) => p.readId)).toEqual(['read-trend-02', 'read-trend-03', 'read-trend-04', 'read-trend-05']);
  });

  it('lists a read whose counts cannot be derived instead of dropping it', () => {
    const broken = makeRead('read-trend-99', '2026-03-10T12:00:00Z', { ...counts.exampleA, rrSmallBoxes: [] });
    const trend = trendSeries([...reads, broken], [], stay, defaultPolicy, fromMs, toMs);
    expect(trend.problems.map((p) => [p.readId, p.errors[0]?.field])).toEqual([['read-trend-99', 'rrSmallBoxes']]);
    expect(trend.rateBpm.points).toHaveLength(3);
  });
});

describe('edge cases', () => {
  it('gives empty series for a window with no reads', () => {
    const trend = trendSeries(reads, [], stay, defaultPolicy, at('2026-03-11T06:00:00Z'), at('2026-03-11T18:00:00Z'));
    expect([trend.rateBpm.points, trend.prMs.points, trend.qrsMs.points, trend.qtcMs.points].map((p) => p.length)).toEqual([0, 0, 0, 0]);
  });
  it('refuses a window that ends before it starts, naming the field', () => {
    expect(() => trendSeries(reads, [], stay, defaultPolicy, toMs, fromMs)).toThrow('toMs must be after fromMs');
  });
  it('refuses NaN bounds', () => {
    expect(() => trendSeries(reads, [], stay, defaultPolicy, Number.NaN, toMs)).toThrow('fromMs must be a finite time in epoch milliseconds');
  });
});
