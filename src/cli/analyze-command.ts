import { analyzeUnknownRead } from '../core/analyze-read.ts';
import type { FieldError } from '../core/field-error.ts';
import { analysisReport } from './analysis-report.ts';
import type { CliIo } from './cli-io.ts';
import { exitCodes } from './cli-io.ts';
import { writeFieldErrors } from './field-errors-output.ts';

/** Help for `rhythm-ledger analyze`. */
export const analyzeHelp = `Usage: rhythm-ledger analyze [FILE]

Analyses one read given as a JSON object, on stdin or in FILE ("-" also means stdin),
and prints the full analysis as JSON on stdout.

Fields of the read (counts in small boxes; fractions allowed):
  paperSpeedMmPerS     25 or 50 (required)
  gainMmPerMv          5, 10 or 20 (default 10)
  rrSmallBoxes         list of R-R counts, e.g. [20, 21, 20]
  ppSmallBoxes         list of P-P counts (atrial rate)
  sixSecondQrsCount    QRS complexes in 6 seconds, 1 to 40 (needed when no R-R is given)
  prSmallBoxes, qrsSmallBoxes, qtSmallBoxes
  sex                  female, male or unknown (default unknown)
  ageYears, paced, bundleBranchBlock, baselineQtcMs, avBlockNoted, rhythmLabel
  previous             the last read's figures: { rateBpm, prMs, qrsMs, qtcMs, qtcFormula }
  policy               { defaultQtcFormula, thresholds: { qtcHighRiskMs: 500, ... },
                         regularityMaxSpreadMs, regularityMaxSpreadPercentOfMean }

Output: every figure unrounded with its unit in its name (rate.rateBpm, intervals.qtMs,
qtc.byFormula, qtc.ordered with the default formula marked, qtc.wideQrs), flags with
severity, limit, source and sentence, rhythm questions, the caution text, and a
"display" block of the same figures rounded as a screen shows them.

Exit codes: 0 analysed; 2 input refused (JSON { "errors": [ { field, message, min, max } ] }
on stdout, one line per field on stderr).

Example:
  echo '{"paperSpeedMmPerS":25,"rrSmallBoxes":[20],"qtSmallBoxes":13,"sex":"male"}' | npx rhythm-ledger analyze
`;

function refuse(io: CliIo, errors: FieldError[]): number {
  writeFieldErrors(io, 'analyze', errors);
  return exitCodes.badInput;
}

/** `rhythm-ledger analyze`: one read in, the full analysis out. */
export async function runAnalyze(args: readonly string[], io: CliIo): Promise<number> {
  if (args.includes('--help') || args.includes('-h')) {
    io.writeOut(analyzeHelp);
    return exitCodes.ok;
  }
  const unknownOption = args.find((a) => a.startsWith('-') && a !== '-');
  if (unknownOption !== undefined) return refuse(io, [{ field: 'arguments', message: `arguments: unknown option ${unknownOption}; see rhythm-ledger analyze --help` }]);
  if (args.length > 1) return refuse(io, [{ field: 'arguments', message: 'arguments: give at most one file; analyze takes one read at a time' }]);

  const file = args[0];
  let text: string;
  if (file !== undefined && file !== '-') {
    try {
      text = await io.readTextFile(file);
    } catch (error) {
      return refuse(io, [{ field: 'input', message: `input: cannot read ${file} (${(error as Error).message})` }]);
    }
  } else if (io.stdinIsTerminal) {
    return refuse(io, [{ field: 'input', message: 'input: no read given; pipe one read as JSON on stdin or name a file (see rhythm-ledger analyze --help)' }]);
  } else {
    text = await io.readStdin();
  }

  if (text.trim() === '') return refuse(io, [{ field: 'input', message: 'input is empty: give one read as a JSON object' }]);
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    return refuse(io, [{ field: 'input', message: `input is not valid JSON (${(error as Error).message})` }]);
  }
  const result = analyzeUnknownRead(raw);
  if (!result.ok) return refuse(io, result.errors);
  io.writeOut(`${JSON.stringify(analysisReport(result.value), null, 2)}\n`);
  return exitCodes.ok;
}
