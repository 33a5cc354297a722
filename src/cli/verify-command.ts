import { withPolicyInput } from '../core/analyze-read.ts';
import { policyInputSchema, fieldErrorsFromZod } from '../core/read-input.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';
import { defaultPolicy } from '../core/unit-policy.ts';
import { knownColumns, parseCasesCsv } from './cases-csv.ts';
import { verificationCaution } from './caution-text.ts';
import type { CliIo } from './cli-io.ts';
import { exitCodes } from './cli-io.ts';
import { writeFieldErrors } from './field-errors-output.ts';
import { formatCheckTable, formatProblems, summaryLine, verifyCases } from './verify-cases.ts';

/** Comma-separated names, wrapped and indented for the help text. */
function wrapList(names: readonly string[], width = 88): string {
  const lines: string[] = [];
  let line = ' ';
  for (const name of names) {
    const piece = ` ${name},`;
    if (line.length + piece.length > width) {
      lines.push(line);
      line = ' ';
    }
    line += piece;
  }
  lines.push(line.replace(/,$/, ''));
  return lines.join('\n');
}

/** Help for `rhythm-ledger verify`. */
export const verifyHelp = `Usage: rhythm-ledger verify CASES.csv [--policy POLICY.json]

Checks the program's arithmetic against your unit's own worked examples before go-live.
Each row of CASES.csv is one read (box counts and patient details) with the figures you
expect; the program analyses it exactly as the app does and prints one line per case and
checked figure (row, case_id, figure, expected, actual, tolerance, PASS or FAIL), then
"N cases, N checks passed, N failed".

Columns (first row names them, any order; lines starting with # are comments):
  case_id                required, unique
  paper_speed_mm_per_s   25 or 50
  gain_mm_per_mv         5, 10 or 20 (default 10)
  rr_small_boxes         one or more R-R counts separated by spaces or ; (e.g. "20 21 20")
  pp_small_boxes         P-P counts, same form
  six_second_qrs_count   QRS complexes in 6 seconds
  pr_small_boxes, qrs_small_boxes, qt_small_boxes
  sex                    female, male or unknown
  age_years, baseline_qtc_ms, rhythm_label
  paced, bundle_branch_block, av_block_noted    yes/no or true/false
  default_qtc_formula    bazett, fridericia, framingham or hodges (default: unit policy)
  previous_rate_bpm, previous_pr_ms, previous_qrs_ms, previous_qtc_ms, previous_qtc_formula
Expected (an empty cell is not checked):
${wrapList(knownColumns.filter((c) => c.startsWith('expect_') && !['expect_flags', 'expect_questions', 'expect_refused_columns'].includes(c)))}
  expect_flags            flag codes separated by spaces, compared as a set; "none" for no flag
  expect_questions        rhythm question codes, compared as a set; "none" for no question
  expect_refused_columns  input columns the program must refuse (a deliberately invalid read)
  tolerance_ms, tolerance_bpm   allowed difference, default 0.5
  note                    free text, not read

--policy POLICY.json applies your unit's limits to every case, e.g.
  { "defaultQtcFormula": "bazett", "thresholds": { "rateLowBpm": 50, "qtcHighRiskMs": 500 } }

Exit codes: 0 every check passed; 1 a check failed; 2 the file or a row could not be read
(the message names the row and the column), or a read was refused that the case did not
expect to be refused.
`;

function parseArgs(args: readonly string[]): { file?: string; policyFile?: string; error?: string } {
  const result: { file?: string; policyFile?: string; error?: string } = {};
  for (let i = 0; i < args.length; i += 1) {
    const arg = args[i]!;
    if (arg === '--policy') {
      const next = args[i + 1];
      if (next === undefined) return { error: '--policy needs a file name' };
      result.policyFile = next;
      i += 1;
    } else if (arg.startsWith('-')) return { error: `unknown option ${arg}; see rhythm-ledger verify --help` };
    else if (result.file !== undefined) return { error: 'give one case file' };
    else result.file = arg;
  }
  if (result.file === undefined) return { error: 'name the case file: rhythm-ledger verify CASES.csv' };
  return result;
}

async function loadPolicy(path: string, io: CliIo): Promise<UnitPolicy | null> {
  let raw: unknown;
  try {
    raw = JSON.parse(await io.readTextFile(path));
  } catch (error) {
    writeFieldErrors(io, 'verify', [{ field: 'policy', message: `policy: cannot read ${path} as JSON (${(error as Error).message})` }]);
    return null;
  }
  const parsed = policyInputSchema.safeParse(raw);
  if (!parsed.success) {
    writeFieldErrors(io, 'verify', fieldErrorsFromZod(parsed.error).map((e) => ({ ...e, field: `policy${e.field === 'input' ? '' : `.${e.field}`}` })));
    return null;
  }
  return withPolicyInput(defaultPolicy, parsed.data);
}

/** `rhythm-ledger verify`: a unit's worked examples against the program's arithmetic. */
export async function runVerify(args: readonly string[], io: CliIo): Promise<number> {
  if (args.includes('--help') || args.includes('-h')) {
    io.writeOut(verifyHelp);
    return exitCodes.ok;
  }
  const parsedArgs = parseArgs(args);
  if (parsedArgs.error !== undefined || parsedArgs.file === undefined) {
    io.writeErr(`rhythm-ledger verify: ${parsedArgs.error}\n`);
    return exitCodes.badInput;
  }
  const file = parsedArgs.file;
  const policy = parsedArgs.policyFile === undefined ? defaultPolicy : await loadPolicy(parsedArgs.policyFile, io);
  if (policy === null) return exitCodes.badInput;

  let text: string;
  try {
    text = await io.readTextFile(file);
  } catch (error) {
    io.writeErr(`rhythm-ledger verify: cannot read ${file} (${(error as Error).message})\n`);
    return exitCodes.badInput;
  }
  const { cases, problems } = parseCasesCsv(text);
  const run = problems.length === 0 ? verifyCases(cases, policy) : null;
  const allProblems = run === null ? problems : run.problems;
  if (run === null || allProblems.length > 0) {
    io.writeErr(`rhythm-ledger verify: ${file} cannot be checked as written; no result is valid until these are fixed:\n${formatProblems(allProblems)}`);
    return exitCodes.badInput;
  }
  io.writeOut(`${formatCheckTable(run.checks)}\n${verificationCaution}\n${summaryLine(run)}\n`);
  return run.failedCount > 0 ? exitCodes.checkFailed : exitCodes.ok;
}
