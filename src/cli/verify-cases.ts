import type { ReadAnalysis } from '../core/analyze-read.ts';
import { analyzeUnknownRead } from '../core/analyze-read.ts';
import { roundForDisplay } from '../core/display-rounding.ts';
import type { FieldError } from '../core/field-error.ts';
import type { ParseResult } from '../core/read-input.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';
import { defaultPolicy } from '../core/unit-policy.ts';
import type { CsvProblem, VerificationCase } from './cases-csv.ts';
import { columnForField } from './cases-csv.ts';
import { actualFigure, figureUnit } from './verification-figures.ts';

/** One checked figure of one case: what the unit expected, what the program computed, and whether they agree. */
export interface CaseCheck {
  row: number;
  caseId: string;
  /** The figure's name as in its expect_ column, without the prefix (e.g. "qtc_bazett_ms", "flags"). */
  figure: string;
  expected: string;
  actual: string;
  tolerance: string;
  passed: boolean;
}

/** Floating-point slack so a difference of exactly the tolerance passes (0.1 + 0.2 style error). */
const comparisonSlack = 1e-9;

const formatActual = (value: number) => String(roundForDisplay(value, 3));
const formatSet = (codes: readonly string[]) => (codes.length === 0 ? 'none' : [...codes].sort().join(' '));
const sameSet = (a: readonly string[], b: readonly string[]) => {
  const left = new Set(a);
  const right = new Set(b);
  return left.size === right.size && [...left].every((x) => right.has(x));
};

/** Refused input named by the table's columns; fields with no column of their own keep the core's name. */
function refusedColumns(errors: readonly FieldError[]): string[] {
  return [...new Set(errors.map((e) => columnForField(e.field) ?? e.field))];
}

/**
 * Compares one case with the core's result for its read. A refused read the case did not expect is a problem with the
 * table (the row cannot be checked), not a failed check; it comes back naming the row and the column.
 */
export function checkCase(verificationCase: VerificationCase, result: ParseResult<ReadAnalysis>): { checks: CaseCheck[]; problems: CsvProblem[] } {
  const { row, caseId } = verificationCase;
  const check = (figure: string, expected: string, actual: string, tolerance: string, passed: boolean): CaseCheck => ({ row, caseId, figure, expected, actual, tolerance, passed });

  if (verificationCase.expectedRefusedColumns) {
    const expected = formatSet(verificationCase.expectedRefusedColumns);
    if (result.ok) return { checks: [check('refused_columns', expected, 'accepted', 'same set', false)], problems: [] };
    const actual = refusedColumns(result.errors);
    return { checks: [check('refused_columns', expected, formatSet(actual), 'same set', sameSet(verificationCase.expectedRefusedColumns, actual))], problems: [] };
  }
  if (!result.ok) {
    const problems = result.errors.map((e): CsvProblem => {
      const column = columnForField(e.field);
      return column === undefined ? { row, message: `the read is refused: ${e.message}` } : { row, column, message: `the read is refused: ${e.message}` };
    });
    return { checks: [], problems };
  }

  const analysis = result.value;
  const checks: CaseCheck[] = [];
  for (const { figure, expected, written } of verificationCase.expectedFigures) {
    const unit = figureUnit(figure);
    const tolerance = unit === 'bpm' ? verificationCase.toleranceBpm : verificationCase.toleranceMs;
    const actual = actualFigure(figure, analysis);
    const passed = actual !== null && Math.abs(actual - expected) <= tolerance + comparisonSlack;
    checks.push(check(figure, written, actual === null ? 'not computed' : formatActual(actual), `±${tolerance} ${unit}`, passed));
  }
  if (verificationCase.expectedFlags) {
    const actual = analysis.flags.map((f) => f.code);
    checks.push(check('flags', formatSet(verificationCase.expectedFlags), formatSet([...new Set(actual)]), 'same set', sameSet(verificationCase.expectedFlags, actual)));
  }
  if (verificationCase.expectedQuestions) {
    const actual = analysis.questions.map((q) => q.code);
    checks.push(check('questions', formatSet(verificationCase.expectedQuestions), formatSet([...new Set(actual)]), 'same set', sameSet(verificationCase.expectedQuestions, actual)));
  }
  return { checks, problems: [] };
}

/** The outcome of a whole table. */
export interface VerificationRun {
  caseCount: number;
  checks: CaseCheck[];
  /** Rows that could not be checked; when any exist the run is not valid as a verification. */
  problems: CsvProblem[];
  passedCount: number;
  failedCount: number;
}

/** Runs every case through the core (validation and analysis, exactly as the app does) and compares. */
export function verifyCases(cases: readonly VerificationCase[], policy: UnitPolicy = defaultPolicy): VerificationRun {
  const checks: CaseCheck[] = [];
  const problems: CsvProblem[] = [];
  for (const c of cases) {
    const outcome = checkCase(c, analyzeUnknownRead(c.input, policy));
    checks.push(...outcome.checks);
    problems.push(...outcome.problems);
  }
  const passedCount = checks.filter((c) => c.passed).length;
  return { caseCount: cases.length, checks, problems, passedCount, failedCount: checks.length - passedCount };
}

/** The pass/fail table: one aligned line per case and checked figure. */
export function formatCheckTable(checks: readonly CaseCheck[]): string {
  const header = ['row', 'case_id', 'figure', 'expected', 'actual', 'tolerance', 'result'];
  const lines = [header, ...checks.map((c) => [String(c.row), c.caseId, c.figure, c.expected, c.actual, c.tolerance, c.passed ? 'PASS' : 'FAIL'])];
  const widths = header.map((_, i) => Math.max(...lines.map((l) => l[i]!.length)));
  return lines.map((l) => l.map((cell, i) => (i === l.length - 1 ? cell : cell.padEnd(widths[i]!))).join('  ')).join('\n') + '\n';
}

/** The closing line: "N cases, N checks passed, N failed". */
export function summaryLine(run: VerificationRun): string {
  return `${run.caseCount} cases, ${run.passedCount} checks passed, ${run.failedCount} failed`;
}

/** Table problems, one line each, naming row and column. */
export function formatProblems(problems: readonly CsvProblem[]): string {
  return [...problems]
    .sort((a, b) => a.row - b.row)
    .map((p) => {
      const message = p.column !== undefined && p.message.startsWith(`${p.column}: `) ? p.message.slice(p.column.length + 2) : p.message;
      return `row ${p.row}${p.column === undefined ? '' : `, column ${p.column}`}: ${message}\n`;
    })
    .join('');
}
