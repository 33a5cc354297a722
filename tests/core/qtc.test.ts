import { describe, expect, it } from 'vitest';
import { smallBoxesToMs } from '../../src/core/boxes-to-ms.ts';
import { roundForDisplay } from '../../src/core/display-rounding.ts';
import { bogossianModifiedQtMs, correctQt, correctQtAllFormulas, jtMs, qtcBazett, qtcFormulas, qtcFramingham, qtcFridericia, qtcHodges } from '../../src/core/qtc.ts';

// Worked examples from clinical reference §4a, computed from the published formulas:
// Bazett HC 1920, "An analysis of the time-relations of electrocardiograms", Heart 7:353;
// Fridericia LS 1920, Acta Med Scand 53:469 (exponent exactly 1/3);
// Sagie A et al. 1992, "An improved method for adjusting the QT interval for heart rate (the Framingham Heart Study)", Am J Cardiol 70:797;
// Hodges M et al. 1983, "Bazett's QT correction reviewed", J Am Coll Cardiol 1:694.
const examples = [
  { ex: 'A', qtSmall: 10, rrLarge: 5, bazett: 400, fridericia: 400, framingham: 400, hodges: 400 },
  { ex: 'B', qtSmall: 9, rrLarge: 4, bazett: 402.49, fridericia: 387.8, framingham: 390.8, hodges: 386.25 },
  { ex: 'C', qtSmall: 8, rrLarge: 3, bazett: 413.12, fridericia: 379.4, framingham: 381.6, hodges: 390.0 },
  { ex: 'D', qtSmall: 12, rrLarge: 6, bazett: 438.18, fridericia: 451.7, framingham: 449.2, hodges: 462.5 },
  { ex: 'F', qtSmall: 13, rrLarge: 4, bazett: 581.38, fridericia: 560.15, framingham: 550.8, hodges: 546.25 },
] as const;

describe('QTc formulas on the worked examples (25 mm/s)', () => {
  for (const e of examples) {
    it(`example ${e.ex}: QT ${e.qtSmall} small boxes, R-R ${e.rrLarge} large boxes`, () => {
      const qtMs = smallBoxesToMs(e.qtSmall, 25);
      const rrMs = smallBoxesToMs(e.rrLarge * 5, 25);
      const all = correctQtAllFormulas(qtMs, rrMs);
      expect(all.bazett).toBeCloseTo(e.bazett, 1);
      expect(all.fridericia).toBeCloseTo(e.fridericia, 1);
      expect(all.framingham).toBeCloseTo(e.framingham, 1);
      expect(all.hodges).toBeCloseTo(e.hodges, 1);
    });
  }
  it('example G: QT 11 small, R-R 25 small gives 440 by every formula', () => {
    const all = correctQtAllFormulas(smallBoxesToMs(11, 25), smallBoxesToMs(25, 25));
    for (const f of qtcFormulas) expect(all[f]).toBeCloseTo(440, 9);
  });
  it('at 50 mm/s, QT 20 small and R-R 50 small give Bazett 400 (clinical reference 4a)', () => {
    expect(qtcBazett(smallBoxesToMs(20, 50), smallBoxesToMs(50, 50))).toBeCloseTo(400, 9);
  });
  it('example D Hodges is exactly 462.5 and displays as 463 (half-up, the app rounding rule)', () => {
    const hodges = qtcHodges(480, 1200);
    expect(hodges).toBeCloseTo(462.5, 9);
    expect(roundForDisplay(hodges)).toBe(463);
  });
  it('uses the exponent exactly 1/3 for Fridericia: QT 280 ms at R-R 0.48 s gives 357.6, not 356.7 as with 0.33 (clinical reference 4.2)', () => {
    expect(qtcFridericia(280, 480)).toBeCloseTo(357.6, 1);
    expect(280 / Math.pow(0.48, 0.33)).toBeCloseTo(356.7, 1);
  });
  it('Framingham uses 154 ms x (1 - RR in s): 360 ms at RR 0.8 s gives 390.8 (Sagie 1992)', () => {
    expect(qtcFramingham(360, 800)).toBeCloseTo(390.8, 9);
  });
  it('Hodges adds 1.75 ms per bpm above 60: QT 320 ms at 100 bpm gives 390 (Hodges 1983)', () => {
    expect(qtcHodges(320, 600)).toBeCloseTo(390, 9);
  });
  it('Bazett is highest at fast rates and lowest at slow rates (clinical reference 4.7; Sagie 1992)', () => {
    const fast = correctQtAllFormulas(320, 600);
    const slow = correctQtAllFormulas(480, 1200);
    expect(fast.bazett).toBeGreaterThan(Math.max(fast.fridericia, fast.framingham, fast.hodges));
    expect(slow.bazett).toBeLessThan(Math.min(slow.fridericia, slow.framingham, slow.hodges));
  });
  it('correctQt dispatches to the named formula', () => {
    expect(correctQt('bazett', 360, 800)).toBe(qtcBazett(360, 800));
    expect(correctQt('fridericia', 360, 800)).toBe(qtcFridericia(360, 800));
    expect(correctQt('framingham', 360, 800)).toBe(qtcFramingham(360, 800));
    expect(correctQt('hodges', 360, 800)).toBe(qtcHodges(360, 800));
  });
});

describe('wide-QRS adjustments (example I: QT 480 ms, QRS 160 ms, RR 0.8 s)', () => {
  // Bogossian H et al. 2014, "New formula for evaluation of the QT interval in patients with left bundle branch block",
  // Heart Rhythm 11:2273 (QTm = QT - 0.5 x QRS); JT = QT - QRS per Bogossian et al. 2020 review, IJC Heart & Vasculature 30:100636.
  it('gives a modified QT of 400 ms, corrected Bazett 447 and Fridericia 431', () => {
    const qtm = bogossianModifiedQtMs(480, 160);
    expect(qtm).toBe(400);
    expect(roundForDisplay(qtcBazett(qtm, 800))).toBe(447);
    expect(roundForDisplay(qtcFridericia(qtm, 800))).toBe(431);
  });
  it('gives JT 320 ms, JTc Bazett 358 and Fridericia 345', () => {
    const jt = jtMs(480, 160);
    expect(jt).toBe(320);
    expect(roundForDisplay(qtcBazett(jt, 800))).toBe(358);
    expect(roundForDisplay(qtcFridericia(jt, 800))).toBe(345);
  });
  it('a plain Bazett QTc on this strip would be 537 ms', () => {
    expect(roundForDisplay(qtcBazett(480, 800))).toBe(537);
  });
});
