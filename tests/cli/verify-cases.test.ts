import { describe, expect, it } from 'vitest';
import type { VerificationCase } from '../../src/cli/cases-csv.ts';
import { parseCasesCsv } from '../../src/cli/cases-csv.ts';
import { checkCase, formatCheckTable, formatProblems, summaryLine, verifyCases } from '../../src/cli/verify-cases.ts';
import { analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import { withPolicyInput } from '../../src/core/analyze-read.ts';
import { defaultPolicy } from '../../src/core/unit-policy.ts';

// Worked example F from the formulas: QT 13 small boxes, R-R 4 large boxes at 25 mm/s (Bazett 1920; Fridericia 1920).
const exampleF = (overrides: Partial<VerificationCase> = {}): VerificationCase => ({
  caseId: 'F',
  row: 7,
  input: { paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 13, sex: 'male' },
  expectedFigures: [],
  toleranceMs: 0.01,
  toleranceBpm: 0.5,
  ...overrides,
});

describe('checkCase', () => {
  it('passes Bazett 581.38 and Fridericia 560.15 for example F (Bazett 1920; Fridericia 1920; worked example F from the formulas)', () => {
    const c = exampleF({
      expectedFigures: [
        { figure: 'qtc_bazett_ms', expected: 581.38, written: '581.38' },
        { figure: 'qtc_fridericia_ms', expected: 560.15, written: '560.15' },
      ],
    });
    const { checks, problems } = checkCase(c, analyzeUnknownRead(c.input));
    expect(problems).toEqual([]);
    expect(checks).toEqual([
      { row: 7, caseId: 'F', figure: 'qtc_bazett_ms', expected: '581.38', actual: '581.378', tolerance: '±0.01 ms', passed: true },
      { row: 7, caseId: 'F', figure: 'qtc_fridericia_ms', expected: '560.15', actual: '560.153', tolerance: '±0.01 ms', passed: true },
    ]);
  });

  it('passes a figure exactly at the tolerance and fails one just outside it', () => {
    // Framingham for example F is 550.8 ms exactly (Sagie et al. 1992, worked example F from the formulas).
    const c = exampleF({
      toleranceMs: 0.2,
      expectedFigures: [
        { figure: 'qtc_framingham_ms', expected: 551, written: '551' },
        { figure: 'qtc_framingham_ms', expected: 551.01, written: '551.01' },
      ],
    });
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks.map((x) => x.passed)).toEqual([true, false]);
  });

  it('uses tolerance_bpm for rates and tolerance_ms for durations', () => {
    // 1500 / 21 small boxes = 71.43 bpm (heart-rate example, 1500 rule).
    const c = exampleF({ input: { paperSpeedMmPerS: 25, rrSmallBoxes: [21] }, toleranceBpm: 0.5, toleranceMs: 0, expectedFigures: [{ figure: 'rate_bpm', expected: 71, written: '71' }] });
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks[0]).toMatchObject({ actual: '71.429', tolerance: '±0.5 bpm', passed: true });
  });

  it('fails a figure the read cannot give, saying it was not computed', () => {
    const c = exampleF({ expectedFigures: [{ figure: 'pr_ms', expected: 160, written: '160' }] });
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks[0]).toMatchObject({ actual: 'not computed', passed: false });
  });

  it('compares flags as a set, whatever the order', () => {
    // QTc of 500 ms or more is high risk (Drew et al. 2010; AACN 2016), example F's Fridericia QTc is 560 ms.
    const pass = exampleF({ expectedFlags: ['qtc-high-risk'] });
    const fail = exampleF({ expectedFlags: ['qtc-high-risk', 'qtc-prolonged'] });
    expect(checkCase(pass, analyzeUnknownRead(pass.input)).checks[0]).toMatchObject({ figure: 'flags', expected: 'qtc-high-risk', actual: 'qtc-high-risk', passed: true });
    expect(checkCase(fail, analyzeUnknownRead(fail.input)).checks[0]).toMatchObject({ expected: 'qtc-high-risk qtc-prolonged', actual: 'qtc-high-risk', passed: false });
  });

  it('checks an expected empty set of questions', () => {
    const c = exampleF({ input: { paperSpeedMmPerS: 25, rrSmallBoxes: [20], prSmallBoxes: 6, rhythmLabel: 'sinus-rhythm' }, expectedQuestions: [] });
    // PR 240 ms with sinus rhythm and no AV block noted raises a question (Kusumoto et al. 2018, > 200 ms).
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks[0]).toMatchObject({ expected: 'none', actual: 'long-pr-no-av-block', passed: false });
  });

  it('passes a deliberately invalid read that is refused on the expected column', () => {
    const c = exampleF({ input: { paperSpeedMmPerS: 30, rrSmallBoxes: [20] }, expectedRefusedColumns: ['paper_speed_mm_per_s'] });
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks[0]).toMatchObject({ figure: 'refused_columns', actual: 'paper_speed_mm_per_s', passed: true });
  });

  it('fails a read expected to be refused that the core accepts', () => {
    const c = exampleF({ expectedRefusedColumns: ['qt_small_boxes'] });
    expect(checkCase(c, analyzeUnknownRead(c.input)).checks[0]).toMatchObject({ actual: 'accepted', passed: false });
  });

  it('turns an unexpected refusal into a problem naming the row and the column, not a check', () => {
    const c = exampleF({ input: { paperSpeedMmPerS: 25, rrSmallBoxes: [10], qtSmallBoxes: 12 }, expectedFigures: [{ figure: 'qt_ms', expected: 480, written: '480' }] });
    const { checks, problems } = checkCase(c, analyzeUnknownRead(c.input));
    expect(checks).toEqual([]);
    expect(problems).toEqual([{ row: 7, column: 'qt_small_boxes', message: expect.stringContaining('must be shorter than the R-R') }]);
  });
});

describe('verifyCases', () => {
  const table = [
    'case_id,paper_speed_mm_per_s,rr_small_boxes,qt_small_boxes,sex,expect_rate_bpm,expect_qtc_bazett_ms,expect_flags,tolerance_ms',
    // Example B: 402.49 by Bazett (Bazett 1920, worked example B from the formulas).
    'B,25,20,9,male,75,402.49,qtc-short,0.01',
    // Example F with the Fridericia figure in the Bazett column: a deliberate mistake.
    'F,25,20,13,male,75,560.15,qtc-high-risk,0.01',
  ].join('\n');

  it('counts cases, passed and failed checks', () => {
    const run = verifyCases(parseCasesCsv(table).cases);
    expect(run).toMatchObject({ caseCount: 2, passedCount: 5, failedCount: 1, problems: [] });
    expect(run.checks.filter((c) => !c.passed)).toEqual([{ row: 3, caseId: 'F', figure: 'qtc_bazett_ms', expected: '560.15', actual: '581.378', tolerance: '±0.01 ms', passed: false }]);
    expect(summaryLine(run)).toBe('2 cases, 5 checks passed, 1 failed');
  });

  it("applies the unit's policy to every case", () => {
    // With a unit high-risk limit of 600 ms the 560 ms QTc of example F is prolonged only (male limit 450, Rautaharju et al. 2009 Part IV).
    const policy = withPolicyInput(defaultPolicy, { thresholds: { qtcHighRiskMs: 600 } });
    const f = parseCasesCsv('case_id,paper_speed_mm_per_s,rr_small_boxes,qt_small_boxes,sex,expect_flags\nF,25,20,13,male,qtc-prolonged\n').cases;
    expect(verifyCases(f, policy).failedCount).toBe(0);
    expect(verifyCases(f).failedCount).toBe(1);
  });
});

describe('formatCheckTable', () => {
  it('prints a header and one aligned line per check, ending in PASS or FAIL', () => {
    const text = formatCheckTable([
      { row: 2, caseId: 'B', figure: 'rate_bpm', expected: '75', actual: '75', tolerance: '±0.5 bpm', passed: true },
      { row: 3, caseId: 'F-mixed', figure: 'qtc_bazett_ms', expected: '560.15', actual: '581.378', tolerance: '±0.01 ms', passed: false },
    ]);
    expect(text.split('\n')).toEqual([
      'row  case_id  figure         expected  actual   tolerance  result',
      '2    B        rate_bpm       75        75       ±0.5 bpm   PASS',
      '3    F-mixed  qtc_bazett_ms  560.15    581.378  ±0.01 ms   FAIL',
      '',
    ]);
  });
});

describe('formatProblems', () => {
  it('orders problems by row and does not repeat the column name', () => {
    expect(
      formatProblems([
        { row: 9, message: 'no expect_ cell is filled in' },
        { row: 4, column: 'qt_small_boxes', message: "qt_small_boxes: '9.O' is not a number" },
      ]),
    ).toBe("row 4, column qt_small_boxes: '9.O' is not a number\nrow 9: no expect_ cell is filled in\n");
  });
});
