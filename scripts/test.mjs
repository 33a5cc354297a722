// Runs the whole Vitest suite and closes with the plain line "N passed, N failed"
// that CI reads, keeping Vitest's exit code.
import { spawnSync } from 'node:child_process';
import { readFileSync, rmSync } from 'node:fs';

const resultsFile = '.vitest-results.json';
rmSync(resultsFile, { force: true });
const run = spawnSync(
  process.execPath,
  ['node_modules/vitest/vitest.mjs', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${resultsFile}`, ...process.argv.slice(2)],
  { stdio: 'inherit' },
);
let passed = 0;
let failed = 0;
let skipped = 0;
try {
  const results = JSON.parse(readFileSync(resultsFile, 'utf8'));
  passed = results.numPassedTests;
  failed = results.numFailedTests + (results.numRuntimeErrorTestSuites ?? 0);
  skipped = results.numPendingTests + results.numTodoTests;
} catch {
  failed += 1;
}
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(run.status ?? 1);
