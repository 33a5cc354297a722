import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import { rateFromSmallBoxes } from '../../src/core/heart-rate.ts';
import { correctQt, qtcFormulas } from '../../src/core/qtc.ts';
import { rhythmLabelIds } from '../../src/core/rhythm-labels.ts';

const halfBoxes = (min: number, max: number) => fc.integer({ min: min * 2, max: max * 2 }).map((n) => n / 2);

/** Valid reads at 25 mm/s: R-R 10-60 boxes (25-150 bpm), QT shorter than the shortest R-R, QRS shorter than QT. */
const validRead = fc
  .record({
    rrSmallBoxes: fc.array(halfBoxes(10, 60), { minLength: 1, maxLength: 12 }),
    qtFraction: fc.double({ min: 0.3, max: 0.95, noNaN: true }),
    qrsSmallBoxes: halfBoxes(1, 4),
    prSmallBoxes: fc.option(halfBoxes(2, 8), { nil: undefined }),
    sixSecondQrsCount: fc.option(fc.integer({ min: 1, max: 40 }), { nil: undefined }),
    sex: fc.constantFrom('female', 'male', 'unknown'),
    paced: fc.boolean(),
    rhythmLabel: fc.option(fc.constantFrom(...rhythmLabelIds), { nil: undefined }),
    baselineQtcMs: fc.option(fc.integer({ min: 300, max: 600 }), { nil: undefined }),
    defaultQtcFormula: fc.constantFrom(...qtcFormulas),
  })
  .map((r) => {
    const shortest = Math.min(...r.rrSmallBoxes);
    const qt = Math.max(r.qrsSmallBoxes + 0.5, Math.max(3, Math.round(shortest * r.qtFraction * 2) / 2));
    return {
      paperSpeedMmPerS: 25 as const,
      rrSmallBoxes: r.rrSmallBoxes,
      qtSmallBoxes: Math.min(qt, 25, shortest - 0.5),
      qrsSmallBoxes: r.qrsSmallBoxes,
      ...(r.prSmallBoxes !== undefined && r.prSmallBoxes < shortest ? { prSmallBoxes: r.prSmallBoxes } : {}),
      ...(r.sixSecondQrsCount !== undefined ? { sixSecondQrsCount: r.sixSecondQrsCount } : {}),
      sex: r.sex,
      paced: r.paced,
      ...(r.rhythmLabel !== undefined ? { rhythmLabel: r.rhythmLabel } : {}),
      ...(r.baselineQtcMs !== undefined ? { baselineQtcMs: r.baselineQtcMs } : {}),
      policy: { defaultQtcFormula: r.defaultQtcFormula },
    };
  })
  .filter((r) => r.qtSmallBoxes > r.qrsSmallBoxes && r.qtSmallBoxes >= 3);

describe('invariants', () => {
  it('rate falls as R-R grows', () => {
    fc.assert(
      fc.property(fc.double({ min: 3.75, max: 150, noNaN: true }), fc.double({ min: 0.01, max: 50, noNaN: true }), fc.constantFrom(25, 50), (rr, extra, speed) => {
        expect(rateFromSmallBoxes(rr + extra, speed)).toBeLessThan(rateFromSmallBoxes(rr, speed));
      }),
    );
  });
  it('every QTc formula returns the QT itself at an R-R of 1 s (clinical reference 4.7)', () => {
    fc.assert(
      fc.property(fc.double({ min: 120, max: 1000, noNaN: true }), fc.constantFrom(...qtcFormulas), (qtMs, formula) => {
        expect(correctQt(formula, qtMs, 1000)).toBeCloseTo(qtMs, 9);
      }),
    );
  });
  it('50 mm/s with doubled counts gives the same figures and flags as 25 mm/s', () => {
    fc.assert(
      fc.property(validRead, (read) => {
        const at25 = analyzeUnknownRead(read);
        const doubled = {
          ...read,
          paperSpeedMmPerS: 50,
          rrSmallBoxes: read.rrSmallBoxes.map((b) => b * 2),
          qtSmallBoxes: read.qtSmallBoxes * 2,
          qrsSmallBoxes: read.qrsSmallBoxes * 2,
          ...('prSmallBoxes' in read && read.prSmallBoxes !== undefined ? { prSmallBoxes: read.prSmallBoxes * 2 } : {}),
        };
        const at50 = analyzeUnknownRead(doubled);
        expect(at25.ok && at50.ok).toBe(true);
        if (!at25.ok || !at50.ok) return;
        expect(at50.value.rate.rateBpm).toBeCloseTo(at25.value.rate.rateBpm, 9);
        expect(at50.value.qtc?.forFlags.qtcMs).toBeCloseTo(at25.value.qtc!.forFlags.qtcMs, 9);
        expect(at50.value.flags.map((f) => f.code)).toEqual(at25.value.flags.map((f) => f.code));
        expect(at50.value.questions).toEqual(at25.value.questions);
      }),
      { numRuns: 300 },
    );
  });
  it('no valid input throws, and every valid read gets a rate and a QTc', () => {
    fc.assert(
      fc.property(validRead, (read) => {
        const result = analyzeUnknownRead(read);
        if (!result.ok) throw new Error(`valid read refused: ${JSON.stringify(result.errors)} for ${JSON.stringify(read)}`);
        expect(Number.isFinite(result.value.rate.rateBpm)).toBe(true);
        expect(Number.isFinite(result.value.qtc?.forFlags.qtcMs)).toBe(true);
      }),
      { numRuns: 500 },
    );
  });
  it('any invalid input gets field-named errors, never an exception', () => {
    const fieldNames = ['paperSpeedMmPerS', 'gainMmPerMv', 'rrSmallBoxes', 'ppSmallBoxes', 'sixSecondQrsCount', 'prSmallBoxes', 'qrsSmallBoxes', 'qtSmallBoxes', 'sex', 'ageYears', 'paced', 'baselineQtcMs', 'previous', 'rhythmLabel', 'policy', 'bundleBranchBlock', 'avBlockNoted'];
    const junk = fc.oneof(fc.constant(null), fc.string(), fc.double(), fc.integer({ min: -1000, max: 1000 }), fc.boolean(), fc.array(fc.anything(), { maxLength: 3 }), fc.object({ maxDepth: 1 }));
    const payload = fc.oneof(
      junk,
      fc.dictionary(fc.constantFrom(...fieldNames), junk, { maxKeys: 6 }),
      validRead.chain((r) => fc.record({ field: fc.constantFrom(...fieldNames), value: junk }).map(({ field, value }) => ({ ...r, [field]: value }))),
    );
    fc.assert(
      fc.property(payload, (raw) => {
        const result = analyzeUnknownRead(raw);
        if (result.ok) return; // the junk happened to be valid for that field
        expect(result.errors.length).toBeGreaterThan(0);
        for (const e of result.errors) {
          expect(e.field.length).toBeGreaterThan(0);
          expect(e.message.length).toBeGreaterThan(5);
          expect(e.message.startsWith(e.field) || e.message.startsWith('unknown field')).toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });
});
