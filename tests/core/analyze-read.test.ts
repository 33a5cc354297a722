import { describe, expect, it } from 'vitest';
import { analyzeReadOrThrow, analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import { ValidationError } from '../../src/core/field-error.ts';

function analysis(raw: unknown) {
  const result = analyzeUnknownRead(raw);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.value;
}

describe('rate method', () => {
  it('uses the 1500 rule for one R-R: 21 small boxes at 25 mm/s is 71.43 bpm (clinical reference 4a)', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [21] });
    expect(a.rate.method).toBe('single-rr');
    expect(a.rate.rateBpm).toBeCloseTo(71.43, 2);
    expect(a.rate.regularity).toBe('unknown');
  });
  it('takes the rate from the mean R-R and reports lowest and highest rate', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [20, 20, 21, 19] });
    expect(a.rate.method).toBe('mean-rr');
    expect(a.rate.rateBpm).toBe(75); // mean 20 boxes = 800 ms
    expect(a.rate.rr?.lowestRateBpm).toBeCloseTo(1500 / 21, 9);
    expect(a.rate.rr?.highestRateBpm).toBeCloseTo(1500 / 19, 9);
    expect(a.rate.regularity).toBe('regular'); // spread 2 boxes = 80 ms (common practice, no source)
  });
  it('calls R-R irregular when the spread exceeds both 80 ms and 10% of the mean (common practice, no source)', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [15, 22, 18, 27] });
    expect(a.rate.regularity).toBe('irregular');
    expect(a.rate.rr?.spreadMs).toBe(480);
    expect(a.rate.methodDescription).toMatch(/irregular/);
  });
  it('prefers the six-second count when R-R is irregular, and says why', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [15, 22, 18, 27], sixSecondQrsCount: 8 });
    expect(a.rate.method).toBe('six-second');
    expect(a.rate.rateBpm).toBe(80); // 8 x 10 (nursing texts)
    expect(a.rate.methodDescription).toMatch(/R-R irregular/);
  });
  it('uses the six-second count alone when no R-R is entered', () => {
    const a = analysis({ paperSpeedMmPerS: 25, sixSecondQrsCount: 11 });
    expect(a.rate.rateBpm).toBe(110);
    expect(a.rate.method).toBe('six-second');
  });
  it('gives 75 bpm for 40 small boxes at 50 mm/s, not 37.5 (clinical reference 4a)', () => {
    expect(analysis({ paperSpeedMmPerS: 50, rrSmallBoxes: [40] }).rate.rateBpm).toBe(75);
  });
  it('gives the atrial rate from P-P counts', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [40], ppSmallBoxes: [20, 20] });
    expect(a.atrialRate?.meanRateBpm).toBe(75);
    expect(a.rate.rateBpm).toBe(37.5);
  });
});

describe('QTc in the analysis', () => {
  it('example F: the unit default (Fridericia) comes first, all four formulas present, R-R used stated', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 13 });
    expect(a.qtc?.ordered.map((o) => o.formula)).toEqual(['fridericia', 'bazett', 'framingham', 'hodges']);
    expect(a.qtc?.ordered[0]?.isDefault).toBe(true);
    expect(a.qtc?.byFormula.bazett).toBeCloseTo(581.38, 2); // Bazett 1920, worked example F
    expect(a.qtc?.rrUsedMs).toBe(800);
    expect(a.qtc?.rrUsedDescription).toBe('the R-R entered (800 ms)');
    expect(a.flags.map((f) => f.code)).toEqual(['qtc-high-risk']);
  });
  it('follows the unit policy formula', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 9, policy: { defaultQtcFormula: 'bazett' } });
    expect(a.qtc?.ordered[0]?.formula).toBe('bazett');
    expect(a.qtc?.forFlags.qtcMs).toBeCloseTo(402.49, 2); // example B, Bazett 1920
  });
  it('marks QTc approximate with irregular R-R (Rautaharju et al. 2009 Part IV)', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [15, 22, 18, 27], qtSmallBoxes: 9 });
    expect(a.qtc?.approximate).toBe(true);
    expect(a.qtc?.warnings.map((w) => w.code)).toContain('irregular-rr');
    expect(a.qtc?.rrUsedMs).toBe(820);
  });
  it('warns when the rate is outside the range where the formula is trusted', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [10], qtSmallBoxes: 7 });
    expect(a.qtc?.warnings.map((w) => w.code)).toContain('rate-outside-formula-range');
  });
  it('warns that Bazett over-corrects above about 85 bpm', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [15], qtSmallBoxes: 8, policy: { defaultQtcFormula: 'bazett' } });
    expect(a.qtc?.warnings.map((w) => w.code)).toContain('bazett-fast-rate');
  });
  it('example I (wide QRS): flags compare QT - 0.5 x QRS corrected, so a plain Bazett 537 does not fire a false urgent flag', () => {
    // Bogossian et al. 2014: QTm = 400, Bazett 447; man, limit 450 (Rautaharju 2009 Part IV).
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 12, qrsSmallBoxes: 4, sex: 'male', policy: { defaultQtcFormula: 'bazett' } });
    expect(a.qtc?.byFormula.bazett).toBeCloseTo(536.66, 2);
    expect(a.qtc?.wideQrs?.modifiedQtMs).toBe(400);
    expect(a.qtc?.wideQrs?.modifiedQtcMs).toBeCloseTo(447.21, 2);
    expect(a.qtc?.wideQrs?.jtMs).toBe(320);
    expect(a.qtc?.wideQrs?.jtcMs).toBeCloseTo(357.77, 2);
    expect(a.qtc?.forFlags.basis).toBe('modified-qt');
    expect(a.flags.map((f) => f.code)).toEqual(['qrs-wide']);
    expect(a.qtc?.warnings.map((w) => w.code)).toContain('wide-qrs');
  });
  it('paced: warns that no formula is validated and uses the adjusted QT', () => {
    const a = analysis({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 12, qrsSmallBoxes: 4, paced: true });
    expect(a.qtc?.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['paced', 'wide-qrs']));
  });
  it('derives R-R from the six-second count when none is counted, and says QTc is approximate', () => {
    const a = analysis({ paperSpeedMmPerS: 25, sixSecondQrsCount: 6, qtSmallBoxes: 10 });
    expect(a.qtc?.rrUsedMs).toBe(1000);
    expect(a.qtc?.approximate).toBe(true);
    expect(a.qtc?.byFormula.fridericia).toBeCloseTo(400, 9);
  });
});

describe('validation', () => {
  const errorsOf = (raw: unknown) => {
    const r = analyzeUnknownRead(raw);
    return r.ok ? [] : r.errors;
  };
  it('refuses a paper speed other than 25 or 50, naming the field', () => {
    expect(errorsOf({ paperSpeedMmPerS: 30, rrSmallBoxes: [20] })).toEqual([{ field: 'paperSpeedMmPerS', message: 'paperSpeedMmPerS must be 25 or 50 (mm/s)' }]);
  });
  it('refuses zero and negative boxes, naming the index', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [20, 0, -3] }).map((e) => e.field)).toEqual(['rrSmallBoxes[1]', 'rrSmallBoxes[2]']);
  });
  it('refuses NaN and infinite counts', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [Number.NaN] })[0]?.field).toBe('rrSmallBoxes[0]');
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: Infinity })[0]?.field).toBe('qtSmallBoxes');
  });
  it('refuses a QT longer than the R-R it sits in', () => {
    const [e] = errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [12], qtSmallBoxes: 13 });
    expect(e).toMatchObject({ field: 'qtSmallBoxes', max: 12 });
    expect(e?.message).toMatch(/shorter than the R-R/);
  });
  it('refuses a PR longer than the R-R', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [10], prSmallBoxes: 11 })[0]?.field).toBe('prSmallBoxes');
  });
  it('refuses more than 100 R-R counts', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: Array.from({ length: 101 }, () => 20) })[0]?.message).toMatch(/at most 100/);
  });
  it('states the allowed range in boxes at the recorded speed and in ms', () => {
    const [e] = errorsOf({ paperSpeedMmPerS: 50, rrSmallBoxes: [200], qtSmallBoxes: 60 });
    expect(e).toEqual({ field: 'qtSmallBoxes', min: 6, max: 50, message: 'qtSmallBoxes must be between 6 and 50 small boxes at 50 mm/s (120-1000 ms); got 60' });
  });
  it('needs a rate source', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, qtSmallBoxes: 10 })[0]?.field).toBe('rrSmallBoxes');
  });
  it('refuses unknown fields instead of ignoring a misspelt count', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBox: 10 })[0]?.message).toMatch(/unknown field\(s\) qtSmallBox/);
  });
  it('refuses a six-second count that is not a whole number from 1 to 40', () => {
    expect(errorsOf({ paperSpeedMmPerS: 25, sixSecondQrsCount: 0 })[0]?.field).toBe('sixSecondQrsCount');
    expect(errorsOf({ paperSpeedMmPerS: 25, sixSecondQrsCount: 7.5 })[0]?.field).toBe('sixSecondQrsCount');
  });
  it('answers non-objects with a message, not an exception', () => {
    for (const raw of [null, 42, 'x', [], undefined]) expect(errorsOf(raw)[0]?.field).toBe('input');
  });
  it('throws a ValidationError carrying the field errors for callers that convert at their edge', () => {
    expect(() => analyzeReadOrThrow({ paperSpeedMmPerS: 30 })).toThrow(ValidationError);
  });
});
