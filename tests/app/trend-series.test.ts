import { describe, expect, it } from 'vitest';
import { trendSeries } from '../../src/app/trend-series.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../src/core/unit-policy.ts';
import { buildDemoWard } from '../../src/store/demo-ward.ts';
import { deriveStayReads } from '../../src/core/stay-reads.ts';

const ward = buildDemoWard(Date.UTC(2026, 4, 12, 3, 10));
const stay = ward.stays.find((s) => s.id === 'demo-stay-02')!;

describe('trendSeries', () => {
  it('plots QTc by the unit formula only, named, with the sex-specific limit among the lines', () => {
    const series = trendSeries(deriveStayReads(ward.reads, [], stay, defaultPolicy), defaultPolicy, 'female');
    const qtc = series.find((s) => s.key === 'qtc')!;
    expect(qtc.title).toBe('QTc by Fridericia (1920)');
    // Female limit 460 ms (Rautaharju et al. 2009, AHA/ACCF/HRS recommendations Part IV); high risk 500 ms (Drew et al. 2010).
    expect(qtc.limits.map((l) => l.value)).toEqual([390, 460, 500]);
    expect(qtc.points.length).toBe(ward.reads.filter((r) => r.stayId === stay.id).length);
  });

  it('follows a change of formula in the unit policy for every point, never mixing two', () => {
    const bazett = applyPolicyOverrides(defaultPolicy, [{ key: 'defaultQtcFormula', value: 'bazett', changedBy: 'T', changedAtMs: 0, reason: 'unit protocol' }]);
    const fridericiaPoints = trendSeries(deriveStayReads(ward.reads, [], stay, defaultPolicy), defaultPolicy, 'female').find((s) => s.key === 'qtc')!.points;
    const bazettSeries = trendSeries(deriveStayReads(ward.reads, [], stay, bazett), bazett, 'female').find((s) => s.key === 'qtc')!;
    expect(bazettSeries.title).toBe('QTc by Bazett (1920)');
    // At R-R under 1 s Bazett corrects more than Fridericia (Bazett 1920; Fridericia 1920), so every point is higher.
    bazettSeries.points.forEach((p, i) => expect(p.value).toBeGreaterThan(fridericiaPoints[i]!.value));
  });

  it('draws the rate limits of the unit policy', () => {
    const series = trendSeries([], defaultPolicy, 'male');
    // 60 and 100 bpm (Spodick et al. 1992, Operational definition of normal sinus heart rate).
    expect(series.find((s) => s.key === 'rate')!.limits.map((l) => l.value)).toEqual([60, 100]);
    expect(series.every((s) => s.points.length === 0)).toBe(true);
  });
});
