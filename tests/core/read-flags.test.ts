import { describe, expect, it } from 'vitest';
import type { FlagContext } from '../../src/core/read-flags.ts';
import { escalationCaution, flagRead, qtcProlongedThreshold } from '../../src/core/read-flags.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../src/core/unit-policy.ts';

const base: FlagContext = {
  rateBpm: 75,
  prMs: 160,
  qrsMs: 80,
  qtcMs: 420,
  qtcFigure: 'QTc (Fridericia)',
  qtcFormula: 'fridericia',
  sex: 'male',
};
const codes = (ctx: Partial<FlagContext>) => flagRead({ ...base, ...ctx }, defaultPolicy).map((f) => f.code);

describe('absolute limits, both sides of each boundary', () => {
  it('raises nothing for a normal read', () => {
    expect(codes({})).toEqual([]);
  });
  // Rautaharju PM et al. 2009, AHA/ACCF/HRS Part IV (J Am Coll Cardiol 53:982): prolonged QTc >= 450 ms men, >= 460 ms women.
  it('men: QTc 449 is not prolonged, 450 is', () => {
    expect(codes({ qtcMs: 449 })).not.toContain('qtc-prolonged');
    expect(codes({ qtcMs: 450 })).toContain('qtc-prolonged');
  });
  it('women: QTc 459 is not prolonged, 460 is', () => {
    expect(codes({ sex: 'female', qtcMs: 459 })).not.toContain('qtc-prolonged');
    expect(codes({ sex: 'female', qtcMs: 460 })).toContain('qtc-prolonged');
  });
  it('sex not recorded: the lower (male) limit of 450 applies, erring towards a flag', () => {
    expect(codes({ sex: 'unknown', qtcMs: 450 })).toContain('qtc-prolonged');
    expect(qtcProlongedThreshold('unknown', defaultPolicy).threshold.value).toBe(450);
  });
  // Rautaharju 2009 Part IV: short QTc <= 390 ms.
  it('short QTc: 390 is short, 391 is not', () => {
    expect(codes({ qtcMs: 390 })).toContain('qtc-short');
    expect(codes({ qtcMs: 391 })).not.toContain('qtc-short');
  });
  // Drew BJ et al. 2010, "Prevention of torsade de pointes in hospital settings", Circulation 121:1047 (> 500 ms);
  // AACN Practice Alert 2016, Crit Care Nurse 36(6):e26 (>= 500 ms). Decision: 500 itself is flagged urgent.
  it('high-risk QTc: 499 is not urgent, 500 and 501 are (inclusive decision)', () => {
    expect(codes({ qtcMs: 499 })).not.toContain('qtc-high-risk');
    expect(codes({ qtcMs: 499 })).toContain('qtc-prolonged');
    expect(codes({ qtcMs: 500 })).toContain('qtc-high-risk');
    expect(codes({ qtcMs: 501 })).toContain('qtc-high-risk');
  });
  it('an urgent QTc replaces the prolonged caution for the same figure', () => {
    const flags = flagRead({ ...base, qtcMs: 520 }, defaultPolicy);
    expect(flags.map((f) => [f.code, f.severity])).toEqual([['qtc-high-risk', 'urgent']]);
  });
  it('compares the unrounded value: 499.6 ms is not flagged urgent although it displays as 500', () => {
    expect(codes({ qtcMs: 499.6 })).not.toContain('qtc-high-risk');
  });
  // StatPearls, Atrioventricular block; Kusumoto FM et al. 2018 ACC/AHA/HRS bradycardia guideline: PR > 200 ms first-degree AV block.
  it('PR 199 and 200 ms are not long, 201 ms is', () => {
    expect(codes({ prMs: 199 })).not.toContain('pr-long');
    expect(codes({ prMs: 200 })).not.toContain('pr-long');
    expect(codes({ prMs: 201 })).toContain('pr-long');
  });
  it('PR 240 ms (6 small boxes at 25 mm/s) is in the first-degree AV block range', () => {
    expect(codes({ prMs: 240 })).toEqual(['pr-long']);
  });
  // Medscape reference (secondary): PR > 300 ms marked.
  it('PR 300 is long, 301 is marked (and not listed twice)', () => {
    expect(codes({ prMs: 300 })).toEqual(['pr-long']);
    expect(codes({ prMs: 301 })).toEqual(['pr-marked']);
  });
  it('PR 119 ms is short, 120 ms is not (normal PR 120-200 ms, StatPearls)', () => {
    expect(codes({ prMs: 119 })).toContain('pr-short');
    expect(codes({ prMs: 120 })).not.toContain('pr-short');
  });
  // Surawicz B et al. 2009, AHA/ACCF/HRS Part III (J Am Coll Cardiol 53:976): QRS >= 120 ms complete BBB duration.
  it('QRS 119 ms is not wide, 120 ms is', () => {
    expect(codes({ qrsMs: 119 })).not.toContain('qrs-wide');
    expect(codes({ qrsMs: 120 })).toContain('qrs-wide');
  });
  // Classic adult sinus range 60-100 bpm (Spodick DH et al. 1992, "Operational definition of normal sinus heart rate", Am J Cardiol 69:1245).
  it('rate 59 is low and 60 is not; 100 is not high and 101 is', () => {
    expect(codes({ rateBpm: 59 })).toContain('rate-low');
    expect(codes({ rateBpm: 60 })).toEqual([]);
    expect(codes({ rateBpm: 100 })).toEqual([]);
    expect(codes({ rateBpm: 101 })).toContain('rate-high');
  });
  it('a unit may lower the bradycardia limit to 50 bpm (Kusumoto 2018), and the flag then names who changed it', () => {
    const policy = applyPolicyOverrides(defaultPolicy, [{ key: 'rateLowBpm', value: 50, changedBy: 'Unit educator R.T.', changedAtMs: 0, reason: 'Unit protocol 2026' }]);
    expect(flagRead({ ...base, rateBpm: 55 }, policy)).toEqual([]);
    const flags = flagRead({ ...base, rateBpm: 49 }, policy);
    expect(flags[0]?.limit.value).toBe(50);
    expect(flags[0]?.source).toContain('Unit educator R.T.');
  });
  it('flags adult limits for age under 16 (clinical reference §8.10)', () => {
    expect(codes({ ageYears: 15 })).toContain('adult-thresholds');
    expect(codes({ ageYears: 16 })).not.toContain('adult-thresholds');
  });
});

describe('change flags', () => {
  // Drew et al. 2010: a QTc rise > 60 ms from the pre-drug baseline.
  it('baseline 440: QTc 500 is a rise of 60 (not > 60), 501 is a rise of 61 (flag)', () => {
    expect(codes({ qtcMs: 500, baselineQtcMs: 440 })).not.toContain('qtc-rise-from-baseline');
    expect(codes({ qtcMs: 501, baselineQtcMs: 440 })).toContain('qtc-rise-from-baseline');
  });
  it('a rise of 61 ms since the last read by the same formula is urgent', () => {
    const flags = flagRead({ ...base, qtcMs: 441, previous: { qtcMs: 380, qtcFormula: 'fridericia' } }, defaultPolicy);
    expect(flags.map((f) => [f.code, f.severity])).toEqual([['qtc-rise-since-last-read', 'urgent']]);
    expect(flags[0]?.value).toBe(61);
  });
  it('does not compare QTc across formulas, and says so', () => {
    const flags = flagRead({ ...base, qtcMs: 480, previous: { qtcMs: 400, qtcFormula: 'bazett' } }, defaultPolicy);
    expect(flags.map((f) => f.code)).toEqual(['qtc-prolonged', 'qtc-not-compared']);
  });
  it('PR newly above 200 ms since the last read', () => {
    expect(codes({ prMs: 220, previous: { prMs: 180 } })).toEqual(['pr-long', 'pr-newly-long']);
    expect(codes({ prMs: 220, previous: { prMs: 210 } })).toEqual(['pr-long']);
  });
  it('QRS newly 120 ms or wider since the last read', () => {
    expect(codes({ qrsMs: 120, previous: { qrsMs: 100 } })).toEqual(['qrs-wide', 'qrs-newly-wide']);
    expect(codes({ qrsMs: 120, previous: { qrsMs: 120 } })).toEqual(['qrs-wide']);
  });
  it('rate crossing a limit since the last read', () => {
    expect(codes({ rateBpm: 48, previous: { rateBpm: 72 } })).toEqual(['rate-low', 'rate-crossed-limit']);
    expect(codes({ rateBpm: 48, previous: { rateBpm: 50 } })).toEqual(['rate-low']);
  });
});

describe('flag wording', () => {
  it('states value, limit and the escalation caution in one sentence, with a source', () => {
    const [flag] = flagRead({ ...base, qtcMs: 512.4 }, defaultPolicy);
    expect(flag?.sentence).toBe(`QTc (Fridericia) 512 ms is at or above the limit of 500 ms (high torsade risk). ${escalationCaution}`);
    expect(flag?.sentence.endsWith("follow your unit's escalation protocol.")).toBe(true);
    expect(flag?.source).toMatch(/Drew et al\. 2010/);
    expect(flag?.limit).toEqual({ comparator: '>=', value: 500, key: 'qtcHighRiskMs' });
  });
  it('orders flags urgent, caution, note', () => {
    const flags = flagRead({ ...base, rateBpm: 50, prMs: 110, qtcMs: 505 }, defaultPolicy);
    expect(flags.map((f) => f.severity)).toEqual(['urgent', 'caution', 'note']);
  });
});
