import { knownFlagCodes, verificationFigures } from './verification-figures.ts';
import type { VerificationFigure } from './verification-figures.ts';

/** One CSV record: its cells, and the line of the file it starts on (row 1 is the first line). */
export interface CsvRecord {
  row: number;
  cells: string[];
}

/** A problem with the file, named by row and, where known, by cell position (1-based) or column name. */
export interface CsvProblem {
  row: number;
  column?: string;
  message: string;
}

const isBlank = (c: string | undefined) => c === ' ' || c === '\t';

/**
 * Splits CSV text into records (RFC 4180: comma-separated, cells may be quoted, "" inside quotes is one quote,
 * quoted cells may hold commas and line breaks). Lines starting with # are comments and blank lines are skipped,
 * so a unit can annotate its table. Unquoted cells are trimmed. Never throws: problems come back with their row.
 */
export function parseCsvRecords(text: string): { records: CsvRecord[]; problems: CsvProblem[] } {
  const src = text.startsWith('\uFEFF') ? text.slice(1) : text;
  const records: CsvRecord[] = [];
  const problems: CsvProblem[] = [];
  const length = src.length;
  let i = 0;
  let line = 1;

  const atLineEnd = () => i >= length || src[i] === '\n' || src[i] === '\r';
  const consumeLineEnd = () => {
    if (src[i] === '\r') i += 1;
    if (src[i] === '\n') i += 1;
    line += 1;
  };

  while (i < length) {
    if (src[i] === '#') {
      while (!atLineEnd()) i += 1;
      consumeLineEnd();
      continue;
    }
    if (atLineEnd()) {
      consumeLineEnd();
      continue;
    }
    const row = line;
    const cells: string[] = [];
    let recordBroken = false;
    for (;;) {
      let j = i;
      while (isBlank(src[j])) j += 1;
      if (src[j] === '"') {
        i = j + 1;
        let value = '';
        let closed = false;
        while (i < length) {
          const c = src[i]!;
          if (c === '"') {
            if (src[i + 1] === '"') {
              value += '"';
              i += 2;
              continue;
            }
            i += 1;
            closed = true;
            break;
          }
          if (c === '\n') line += 1;
          value += c;
          i += 1;
        }
        if (!closed) {
          problems.push({ row, column: `cell ${cells.length + 1}`, message: `a quoted cell starting on row ${row} is never closed; add the closing quote (")` });
          recordBroken = true;
          break;
        }
        while (isBlank(src[i])) i += 1;
        if (!atLineEnd() && src[i] !== ',') {
          problems.push({ row, column: `cell ${cells.length + 1}`, message: 'text after a closing quote; quote the whole cell and write a quote inside it as ""' });
          while (!atLineEnd() && src[i] !== ',') i += 1;
        }
        cells.push(value);
      } else {
        let value = '';
        while (!atLineEnd() && src[i] !== ',') {
          value += src[i];
          i += 1;
        }
        if (value.includes('"')) problems.push({ row, column: `cell ${cells.length + 1}`, message: 'a quote inside an unquoted cell; quote the whole cell and write a quote inside it as ""' });
        cells.push(value.trim());
      }
      if (src[i] === ',') {
        i += 1;
        continue;
      }
      if (i < length) consumeLineEnd();
      break;
    }
    if (!recordBroken) records.push({ row, cells });
  }
  return { records, problems };
}

type CellKind = 'number' | 'number-list' | 'boolean' | 'text';

/** Input columns: each fills one field of the read (dotted paths fill nested objects). */
export const inputColumns = {
  paper_speed_mm_per_s: { path: ['paperSpeedMmPerS'], kind: 'number' },
  gain_mm_per_mv: { path: ['gainMmPerMv'], kind: 'number' },
  rr_small_boxes: { path: ['rrSmallBoxes'], kind: 'number-list' },
  pp_small_boxes: { path: ['ppSmallBoxes'], kind: 'number-list' },
  six_second_qrs_count: { path: ['sixSecondQrsCount'], kind: 'number' },
  pr_small_boxes: { path: ['prSmallBoxes'], kind: 'number' },
  qrs_small_boxes: { path: ['qrsSmallBoxes'], kind: 'number' },
  qt_small_boxes: { path: ['qtSmallBoxes'], kind: 'number' },
  sex: { path: ['sex'], kind: 'text' },
  age_years: { path: ['ageYears'], kind: 'number' },
  paced: { path: ['paced'], kind: 'boolean' },
  bundle_branch_block: { path: ['bundleBranchBlock'], kind: 'boolean' },
  baseline_qtc_ms: { path: ['baselineQtcMs'], kind: 'number' },
  rhythm_label: { path: ['rhythmLabel'], kind: 'text' },
  av_block_noted: { path: ['avBlockNoted'], kind: 'boolean' },
  default_qtc_formula: { path: ['policy', 'defaultQtcFormula'], kind: 'text' },
  previous_rate_bpm: { path: ['previous', 'rateBpm'], kind: 'number' },
  previous_pr_ms: { path: ['previous', 'prMs'], kind: 'number' },
  previous_qrs_ms: { path: ['previous', 'qrsMs'], kind: 'number' },
  previous_qtc_ms: { path: ['previous', 'qtcMs'], kind: 'number' },
  previous_qtc_formula: { path: ['previous', 'qtcFormula'], kind: 'text' },
} as const satisfies Record<string, { path: readonly string[]; kind: CellKind }>;
export type InputColumn = keyof typeof inputColumns;

const figureColumn = (figure: VerificationFigure) => `expect_${figure}`;
const setColumns = ['expect_flags', 'expect_questions', 'expect_refused_columns'] as const;
const otherColumns = ['case_id', 'tolerance_ms', 'tolerance_bpm', 'note'] as const;

/** Every column a case table may have, in the order the README lists them. */
export const knownColumns: readonly string[] = [...otherColumns.slice(0, 1), ...Object.keys(inputColumns), ...verificationFigures.map(figureColumn), ...setColumns, ...otherColumns.slice(1)];

/** Tolerance when a case leaves tolerance_ms or tolerance_bpm empty: half a unit, so a value rounded to whole ms or bpm passes. */
export const defaultTolerance = 0.5;

/** One expected figure and the text it was written as (kept for the report). */
export interface ExpectedFigure {
  figure: VerificationFigure;
  expected: number;
  written: string;
}

/** One row of a case table: the read it describes and what the program should make of it. */
export interface VerificationCase {
  caseId: string;
  row: number;
  /** The read as the core's input, before validation (the core validates it as it would any input). */
  input: Record<string, unknown>;
  expectedFigures: ExpectedFigure[];
  /** Flag codes expected, as a set; undefined when not checked, empty for "none". */
  expectedFlags?: string[];
  expectedQuestions?: string[];
  /** Columns the program must refuse (the read is invalid on purpose). */
  expectedRefusedColumns?: string[];
  toleranceMs: number;
  toleranceBpm: number;
}

const numberPattern = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

type Parsed<T> = { ok: true; value: T } | { ok: false; message: string };

/** A number written with a decimal point; a decimal comma or a unit in the cell is refused rather than guessed. */
export function parseNumberCell(column: string, text: string): Parsed<number> {
  const trimmed = text.trim();
  if (!numberPattern.test(trimmed)) return { ok: false, message: `${column}: '${text}' is not a number (write e.g. 12 or 12.5, no units, a point for decimals)` };
  return { ok: true, value: Number(trimmed) };
}

/** Several numbers separated by spaces or semicolons (or commas inside a quoted cell). */
export function parseNumberListCell(column: string, text: string): Parsed<number[]> {
  const parts = text.split(/[\s;,]+/).filter((p) => p !== '');
  const values: number[] = [];
  for (const [index, part] of parts.entries()) {
    const parsed = parseNumberCell(column, part);
    if (!parsed.ok) return { ok: false, message: `${column}: count ${index + 1} '${part}' is not a number (separate counts with spaces or ;)` };
    values.push(parsed.value);
  }
  return { ok: true, value: values };
}

const trueWords = new Set(['true', 'yes', 'y', '1']);
const falseWords = new Set(['false', 'no', 'n', '0']);

/** true/false, yes/no, y/n or 1/0, any case. */
export function parseBooleanCell(column: string, text: string): Parsed<boolean> {
  const word = text.trim().toLowerCase();
  if (trueWords.has(word)) return { ok: true, value: true };
  if (falseWords.has(word)) return { ok: true, value: false };
  return { ok: false, message: `${column}: '${text}' is not yes or no (write true, false, yes or no)` };
}

/** Codes separated by spaces, semicolons or commas; "none" means the set must be empty. */
function parseSetCell(text: string): string[] {
  const codes = text.split(/[\s;,]+/).filter((p) => p !== '');
  return codes.length === 1 && codes[0]!.toLowerCase() === 'none' ? [] : [...new Set(codes)];
}

function setPath(target: Record<string, unknown>, path: readonly string[], value: unknown): void {
  let node = target;
  for (const key of path.slice(0, -1)) {
    node[key] ??= {};
    node = node[key] as Record<string, unknown>;
  }
  node[path[path.length - 1]!] = value;
}

/** The table column a core field name comes from ("rrSmallBoxes[2]" -> "rr_small_boxes"), so refusals name what the unit typed. */
export function columnForField(field: string): string | undefined {
  const path = field.replace(/\[\d+\]/g, '');
  for (const [column, spec] of Object.entries(inputColumns)) {
    if (spec.path.join('.') === path) return column;
  }
  return undefined;
}

/**
 * Reads a unit's case table. The first record names the columns (any order, any case); each further record is one case.
 * Never throws: every problem comes back naming its row and column, and a file with any problem is not run.
 */
export function parseCasesCsv(text: string): { cases: VerificationCase[]; problems: CsvProblem[] } {
  const { records, problems } = parseCsvRecords(text);
  const cases: VerificationCase[] = [];
  const header = records[0];
  if (header === undefined) {
    if (problems.length === 0) problems.push({ row: 1, message: 'the file holds no table: the first row must name the columns (case_id, paper_speed_mm_per_s, ...)' });
    return { cases, problems };
  }
  const columns = header.cells.map((c) => c.trim().toLowerCase());
  const nameOf = (cellNumber: number) => columns[cellNumber - 1] ?? `cell ${cellNumber}`;
  for (const p of problems) {
    const cell = /^cell (\d+)$/.exec(p.column ?? '');
    if (cell && p.row !== header.row) p.column = nameOf(Number(cell[1]));
  }

  const seen = new Set<string>();
  for (const column of columns) {
    if (column === '') problems.push({ row: header.row, message: 'a column has no name; name every column in the first row' });
    else if (!knownColumns.includes(column)) problems.push({ row: header.row, column, message: `unknown column '${column}'; check the spelling (rhythm-ledger verify --help lists the columns)` });
    else if (seen.has(column)) problems.push({ row: header.row, column, message: `column '${column}' appears twice` });
    seen.add(column);
  }
  if (!columns.includes('case_id')) problems.push({ row: header.row, column: 'case_id', message: 'the first row must name a case_id column' });

  const caseRows = new Map<string, number>();
  for (const record of records.slice(1)) {
    if (record.cells.every((c) => c.trim() === '')) continue;
    const row = record.row;
    const fail = (column: string | undefined, message: string) => problems.push(column === undefined ? { row, message } : { row, column, message });
    const extra = record.cells.slice(columns.length).findIndex((c) => c.trim() !== '');
    if (extra >= 0) fail(`cell ${columns.length + extra + 1}`, `this row has ${record.cells.length} cells but the first row names only ${columns.length} columns`);
    const cell = (column: string): string => {
      const index = columns.indexOf(column);
      return index < 0 ? '' : (record.cells[index] ?? '').trim();
    };

    const caseId = cell('case_id');
    if (caseId === '') fail('case_id', 'case_id is empty; give every case a name');
    else if (caseRows.has(caseId)) fail('case_id', `case_id '${caseId}' is already used on row ${caseRows.get(caseId)}`);
    else caseRows.set(caseId, row);

    const input: Record<string, unknown> = {};
    for (const [column, spec] of Object.entries(inputColumns) as Array<[InputColumn, (typeof inputColumns)[InputColumn]]>) {
      const text = cell(column);
      if (text === '') continue;
      const parsed: Parsed<unknown> =
        spec.kind === 'number' ? parseNumberCell(column, text) : spec.kind === 'number-list' ? parseNumberListCell(column, text) : spec.kind === 'boolean' ? parseBooleanCell(column, text) : { ok: true, value: text };
      if (parsed.ok) setPath(input, spec.path, parsed.value);
      else fail(column, parsed.message);
    }

    const expectedFigures: ExpectedFigure[] = [];
    for (const figure of verificationFigures) {
      const column = figureColumn(figure);
      const text = cell(column);
      if (text === '') continue;
      const parsed = parseNumberCell(column, text);
      if (parsed.ok) expectedFigures.push({ figure, expected: parsed.value, written: text });
      else fail(column, parsed.message);
    }

    const tolerance = (column: string): number => {
      const text = cell(column);
      if (text === '') return defaultTolerance;
      const parsed = parseNumberCell(column, text);
      if (!parsed.ok) fail(column, parsed.message);
      else if (parsed.value < 0) fail(column, `${column}: must be 0 or more; got ${text}`);
      return parsed.ok ? parsed.value : defaultTolerance;
    };

    const verificationCase: VerificationCase = { caseId, row, input, expectedFigures, toleranceMs: tolerance('tolerance_ms'), toleranceBpm: tolerance('tolerance_bpm') };

    if (cell('expect_flags') !== '') {
      const flags = parseSetCell(cell('expect_flags'));
      const unknown = flags.filter((f) => !(knownFlagCodes as readonly string[]).includes(f));
      if (unknown.length > 0) fail('expect_flags', `expect_flags: unknown flag code(s) ${unknown.join(', ')}; known codes: ${knownFlagCodes.join(', ')}`);
      verificationCase.expectedFlags = flags;
    }
    if (cell('expect_questions') !== '') verificationCase.expectedQuestions = parseSetCell(cell('expect_questions'));
    if (cell('expect_refused_columns') !== '') {
      const refused = parseSetCell(cell('expect_refused_columns'));
      const unknown = refused.filter((c) => !(c in inputColumns));
      if (unknown.length > 0) fail('expect_refused_columns', `expect_refused_columns: ${unknown.join(', ')} is not an input column`);
      if (refused.length === 0) fail('expect_refused_columns', 'expect_refused_columns: name the column(s) the program must refuse, or leave the cell empty');
      if (expectedFigures.length > 0 || verificationCase.expectedFlags || verificationCase.expectedQuestions) {
        fail('expect_refused_columns', 'a case that expects its read to be refused cannot also expect figures, flags or questions');
      }
      verificationCase.expectedRefusedColumns = refused;
    }
    const checksSomething = expectedFigures.length > 0 || verificationCase.expectedFlags || verificationCase.expectedQuestions || verificationCase.expectedRefusedColumns;
    if (!checksSomething && !problems.some((p) => p.row === row)) fail(undefined, 'no expect_ cell is filled in: a case must check at least one figure, its flags, its questions or a refusal');
    cases.push(verificationCase);
  }
  if (cases.length === 0 && problems.length === 0) problems.push({ row: header.row, message: 'the table has no cases: add one row per case under the column names' });
  return { cases, problems };
}
