import { describe, expect, it } from 'vitest';
import { columnForField, parseBooleanCell, parseCasesCsv, parseCsvRecords, parseNumberCell, parseNumberListCell } from '../../src/cli/cases-csv.ts';

describe('parseCsvRecords', () => {
  it('splits plain cells and trims the spaces around unquoted ones', () => {
    const { records, problems } = parseCsvRecords('a,b,c\n 1 , 2,3\n');
    expect(problems).toEqual([]);
    expect(records).toEqual([
      { row: 1, cells: ['a', 'b', 'c'] },
      { row: 2, cells: ['1', '2', '3'] },
    ]);
  });

  it('keeps commas, doubled quotes and line breaks inside quoted cells', () => {
    const { records, problems } = parseCsvRecords('id,note\nx,"20, 21 ""boxes""\nsecond line"\ny,plain\n');
    expect(problems).toEqual([]);
    expect(records[1]).toEqual({ row: 2, cells: ['x', '20, 21 "boxes"\nsecond line'] });
    expect(records[2]).toEqual({ row: 4, cells: ['y', 'plain'] });
  });

  it('keeps empty cells, including a trailing one', () => {
    const { records } = parseCsvRecords('a,b,c\n1,,\n');
    expect(records[1]!.cells).toEqual(['1', '', '']);
  });

  it('skips comment lines and blank lines but counts them in row numbers', () => {
    const { records } = parseCsvRecords('# invented cases\n\na,b\r\n\r\n1,2\r\n');
    expect(records).toEqual([
      { row: 3, cells: ['a', 'b'] },
      { row: 5, cells: ['1', '2'] },
    ]);
  });

  it('drops a byte-order mark before the first column name', () => {
    expect(parseCsvRecords('\uFEFFcase_id\nA').records[0]!.cells).toEqual(['case_id']);
  });

  it('reads a last line with no line break', () => {
    expect(parseCsvRecords('a,b\n1,2').records[1]).toEqual({ row: 2, cells: ['1', '2'] });
  });

  describe('edge cases', () => {
    it('names the row of a quoted cell that is never closed', () => {
      const { records, problems } = parseCsvRecords('a,b\n1,"open\n2,3\n');
      expect(records).toHaveLength(1);
      expect(problems).toEqual([{ row: 2, column: 'cell 2', message: expect.stringContaining('never closed') }]);
    });

    it('refuses a stray quote inside an unquoted cell', () => {
      const { problems } = parseCsvRecords('a\n12"5\n');
      expect(problems).toEqual([{ row: 2, column: 'cell 1', message: expect.stringContaining('quote inside an unquoted cell') }]);
    });

    it('refuses text after a closing quote', () => {
      const { problems } = parseCsvRecords('a,b\n"20" 21,x\n');
      expect(problems).toEqual([{ row: 2, column: 'cell 1', message: expect.stringContaining('text after a closing quote') }]);
    });

    it('returns nothing, and no problem, for empty text', () => {
      expect(parseCsvRecords('')).toEqual({ records: [], problems: [] });
    });
  });
});

describe('cell parsers', () => {
  it('reads whole and decimal numbers', () => {
    expect(parseNumberCell('qt_small_boxes', '12.5')).toEqual({ ok: true, value: 12.5 });
    expect(parseNumberCell('qt_small_boxes', ' 13 ')).toEqual({ ok: true, value: 13 });
    expect(parseNumberCell('qt_small_boxes', '.5')).toEqual({ ok: true, value: 0.5 });
  });

  it('refuses a decimal comma, a unit or an empty-looking number, naming the column', () => {
    for (const text of ['12,5', '13 boxes', '-', 'NaN', 'Infinity', '0x10']) {
      const parsed = parseNumberCell('qt_small_boxes', text);
      expect(parsed.ok).toBe(false);
      if (!parsed.ok) expect(parsed.message).toMatch(/^qt_small_boxes: '.*' is not a number/);
    }
  });

  it('reads count lists separated by spaces, semicolons or commas', () => {
    expect(parseNumberListCell('rr_small_boxes', '20 21;22, 19.5')).toEqual({ ok: true, value: [20, 21, 22, 19.5] });
  });

  it('names the position of a bad count in a list', () => {
    expect(parseNumberListCell('rr_small_boxes', '20 2O 21')).toEqual({ ok: false, message: "rr_small_boxes: count 2 '2O' is not a number (separate counts with spaces or ;)" });
  });

  it('reads yes/no words in any case and refuses anything else', () => {
    expect(parseBooleanCell('paced', 'Yes')).toEqual({ ok: true, value: true });
    expect(parseBooleanCell('paced', 'FALSE')).toEqual({ ok: true, value: false });
    expect(parseBooleanCell('paced', 'maybe')).toEqual({ ok: false, message: "paced: 'maybe' is not yes or no (write true, false, yes or no)" });
  });
});

describe('columnForField', () => {
  it('maps core field names, indexed or nested, back to the table column', () => {
    expect(columnForField('rrSmallBoxes[2]')).toBe('rr_small_boxes');
    expect(columnForField('policy.defaultQtcFormula')).toBe('default_qtc_formula');
    expect(columnForField('previous.qtcMs')).toBe('previous_qtc_ms');
    expect(columnForField('input')).toBeUndefined();
  });
});

describe('parseCasesCsv', () => {
  const header = 'case_id,paper_speed_mm_per_s,rr_small_boxes,qt_small_boxes,sex,paced,default_qtc_formula,previous_qtc_ms,expect_qtc_bazett_ms,expect_flags,tolerance_ms';

  it('builds the read and the expectations of each case', () => {
    const { cases, problems } = parseCasesCsv(`${header}\nF,25,"20 20",13,male,no,bazett,520,581.38,qtc-high-risk qtc-prolonged,0.01\n`);
    expect(problems).toEqual([]);
    expect(cases).toEqual([
      {
        caseId: 'F',
        row: 2,
        input: { paperSpeedMmPerS: 25, rrSmallBoxes: [20, 20], qtSmallBoxes: 13, sex: 'male', paced: false, policy: { defaultQtcFormula: 'bazett' }, previous: { qtcMs: 520 } },
        expectedFigures: [{ figure: 'qtc_bazett_ms', expected: 581.38, written: '581.38' }],
        expectedFlags: ['qtc-high-risk', 'qtc-prolonged'],
        toleranceMs: 0.01,
        toleranceBpm: 0.5,
      },
    ]);
  });

  it('leaves empty input cells out of the read and empty expect cells unchecked', () => {
    const { cases } = parseCasesCsv(`${header}\nG,25,25,,,,,,440,,\n`);
    expect(cases[0]!.input).toEqual({ paperSpeedMmPerS: 25, rrSmallBoxes: [25] });
    expect(cases[0]!.expectedFigures).toHaveLength(1);
    expect(cases[0]!.expectedFlags).toBeUndefined();
    expect(cases[0]!.toleranceMs).toBe(0.5);
  });

  it('reads "none" as an expected empty set of flags', () => {
    expect(parseCasesCsv(`${header}\nA,25,25,10,,,,,400,none,\n`).cases[0]!.expectedFlags).toEqual([]);
  });

  it('accepts column names in any order and any case', () => {
    const { cases, problems } = parseCasesCsv('Expect_Rate_Bpm,RR_Small_Boxes,Paper_Speed_mm_per_s,Case_ID\n75,20,25,x\n');
    expect(problems).toEqual([]);
    expect(cases[0]!.input).toEqual({ paperSpeedMmPerS: 25, rrSmallBoxes: [20] });
  });

  describe('edge cases', () => {
    it('names the row and the column of a bad number', () => {
      const { problems } = parseCasesCsv(`${header}\nA,25,25,10,,,,,400,,\nB,25,20,9.O,,,,,402.49,,\n`);
      expect(problems).toEqual([{ row: 3, column: 'qt_small_boxes', message: "qt_small_boxes: '9.O' is not a number (write e.g. 12 or 12.5, no units, a point for decimals)" }]);
    });

    it('names the column of a bad expected value and of a negative tolerance', () => {
      const { problems } = parseCasesCsv(`${header}\nA,25,25,10,,,,,about 400,,-1\n`);
      expect(problems.map((p) => [p.row, p.column])).toEqual([
        [2, 'expect_qtc_bazett_ms'],
        [2, 'tolerance_ms'],
      ]);
    });

    it('refuses an unknown column, so a misspelt expectation is never silently skipped', () => {
      const { problems } = parseCasesCsv('case_id,paper_speed_mm_per_s,rr_small_boxes,expect_qtc_bazet_ms\nA,25,25,400\n');
      expect(problems).toContainEqual({ row: 1, column: 'expect_qtc_bazet_ms', message: expect.stringContaining("unknown column 'expect_qtc_bazet_ms'") });
    });

    it('refuses a table without a case_id column and a repeated column', () => {
      const { problems } = parseCasesCsv('paper_speed_mm_per_s,paper_speed_mm_per_s\n25,25\n');
      expect(problems.map((p) => p.column)).toEqual(expect.arrayContaining(['paper_speed_mm_per_s', 'case_id']));
    });

    it('refuses an empty or repeated case_id, naming the earlier row', () => {
      const { problems } = parseCasesCsv(`${header}\nA,25,25,10,,,,,400,,\nA,25,25,10,,,,,400,,\n,25,25,10,,,,,400,,\n`);
      expect(problems).toEqual([
        { row: 3, column: 'case_id', message: "case_id 'A' is already used on row 2" },
        { row: 4, column: 'case_id', message: 'case_id is empty; give every case a name' },
      ]);
    });

    it('refuses a row that checks nothing', () => {
      const { problems } = parseCasesCsv(`${header}\nA,25,25,10,,,,,,,\n`);
      expect(problems).toEqual([{ row: 2, message: expect.stringContaining('no expect_ cell is filled in') }]);
    });

    it('refuses an unknown flag code, listing the known ones', () => {
      const { problems } = parseCasesCsv(`${header}\nA,25,25,10,,,,,,qtc-hi,\n`);
      expect(problems).toEqual([{ row: 2, column: 'expect_flags', message: expect.stringMatching(/unknown flag code\(s\) qtc-hi; known codes: .*qtc-high-risk/) }]);
    });

    it('refuses a row with more filled cells than named columns', () => {
      const { problems } = parseCasesCsv('case_id,paper_speed_mm_per_s,expect_rate_bpm\nA,25,75,oops\n');
      expect(problems).toEqual([{ row: 2, column: 'cell 4', message: 'this row has 4 cells but the first row names only 3 columns' }]);
    });

    it('names the column of a quoted cell that is never closed', () => {
      const { problems } = parseCasesCsv('case_id,rr_small_boxes,expect_rate_bpm\nA,"20 21,75\n');
      expect(problems).toEqual([{ row: 2, column: 'rr_small_boxes', message: expect.stringContaining('never closed') }]);
    });

    it('refuses a refusal case that also expects figures', () => {
      const { problems } = parseCasesCsv('case_id,paper_speed_mm_per_s,expect_rate_bpm,expect_refused_columns\nA,30,75,paper_speed_mm_per_s\n');
      expect(problems).toEqual([{ row: 2, column: 'expect_refused_columns', message: expect.stringContaining('cannot also expect figures') }]);
    });

    it('says so when the file is empty or has only column names', () => {
      expect(parseCasesCsv('').problems).toEqual([{ row: 1, message: expect.stringContaining('holds no table') }]);
      expect(parseCasesCsv('# comment\ncase_id,expect_rate_bpm\n').problems).toEqual([{ row: 2, message: expect.stringContaining('no cases') }]);
    });

    it('skips rows whose cells are all empty, as spreadsheets export them', () => {
      const { cases, problems } = parseCasesCsv('case_id,paper_speed_mm_per_s,rr_small_boxes,expect_rate_bpm\n,,,\nA,25,20,75\n');
      expect(problems).toEqual([]);
      expect(cases.map((c) => c.caseId)).toEqual(['A']);
    });
  });
});
