import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const repoRoot = fileURLToPath(new URL('../..', import.meta.url));

/** Runs the real command as a unit would, from the repository root. */
function rhythmLedger(args: string[], stdin?: string) {
  const result = spawnSync(process.execPath, ['bin/rhythm-ledger.mjs', ...args], { cwd: repoRoot, input: stdin ?? '', encoding: 'utf8', timeout: 30_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

const lastLine = (text: string) => text.trimEnd().split('\n').at(-1);

describe('rhythm-ledger analyze', () => {
  // Worked example F from the formulas: QT 13 small boxes (520 ms), R-R 4 large boxes (800 ms), 25 mm/s.
  const exampleF = JSON.stringify({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qtSmallBoxes: 13, sex: 'male' });

  it('gives Bazett 581.38 and Fridericia 560.15 ms for example F, with an urgent high-risk flag', () => {
    const { status, stdout, stderr } = rhythmLedger(['analyze'], exampleF);
    expect(stderr).toBe('');
    expect(status).toBe(0);
    const report = JSON.parse(stdout);
    // Bazett 1920; Fridericia 1920; worked example F from the formulas.
    expect(report.qtc.byFormula.bazett).toBeCloseTo(581.38, 2);
    expect(report.qtc.byFormula.fridericia).toBeCloseTo(560.15, 2);
    // Sagie et al. 1992 and Hodges et al. 1983; worked example F from the formulas.
    expect(report.qtc.byFormula.framingham).toBeCloseTo(550.8, 6);
    expect(report.qtc.byFormula.hodges).toBeCloseTo(546.25, 6);
    expect(report.qtc.ordered[0]).toMatchObject({ formula: 'fridericia', isDefault: true });
    expect(report.qtc.ordered.filter((o: { isDefault: boolean }) => o.isDefault)).toHaveLength(1);
    // QTc of 500 ms or more is high risk (Drew et al. 2010; AACN Practice Alert 2016).
    expect(report.flags).toEqual([
      expect.objectContaining({
        code: 'qtc-high-risk',
        severity: 'urgent',
        limit: { comparator: '>=', value: 500, key: 'qtcHighRiskMs' },
        source: expect.stringContaining('Drew et al. 2010'),
        sentence: expect.stringContaining('QTc (Fridericia) 560 ms is at or above the limit of 500 ms'),
      }),
    ]);
    expect(report.rate.rateBpm).toBe(75);
    expect(report.display).toMatchObject({ rateBpm: 75, qtMs: 520, qtcBazettMs: 581, qtcFridericiaMs: 560, qtcFraminghamMs: 551, qtcHodgesMs: 546, qtcDefaultMs: 560 });
    expect(report.caution).toMatch(/^Decision support only\./);
    expect(report.coreVersion).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('refuses a paper speed of 30 mm/s with exit code 2, naming the field and the allowed values', () => {
    const { status, stdout, stderr } = rhythmLedger(['analyze'], '{"paperSpeedMmPerS": 30}');
    expect(status).toBe(2);
    expect(JSON.parse(stdout)).toEqual({ errors: [{ field: 'paperSpeedMmPerS', message: 'paperSpeedMmPerS must be 25 or 50 (mm/s)' }] });
    expect(stderr).toContain('paperSpeedMmPerS must be 25 or 50 (mm/s)');
  });

  it('refuses invalid JSON with exit code 2 on the field "input"', () => {
    const { status, stdout, stderr } = rhythmLedger(['analyze'], '{"paperSpeedMmPerS": 25,');
    expect(status).toBe(2);
    const { errors } = JSON.parse(stdout);
    expect(errors).toHaveLength(1);
    expect(errors[0].field).toBe('input');
    expect(errors[0].message).toMatch(/^input is not valid JSON/);
    expect(stderr).toContain('input is not valid JSON');
  });
});

describe('rhythm-ledger verify', () => {
  it('passes every check of the shipped example cases and exits 0', () => {
    const { status, stdout, stderr } = rhythmLedger(['verify', 'examples/verification-cases.csv']);
    expect(stderr).toBe('');
    expect(status).toBe(0);
    const rows = stdout.split('\n').filter((l) => /\s(PASS|FAIL)$/.test(l));
    expect(rows.length).toBeGreaterThan(90);
    expect(rows.every((l) => l.endsWith('PASS'))).toBe(true);
    expect(stdout).not.toContain('FAIL');
    expect(lastLine(stdout)).toBe(`28 cases, ${rows.length} checks passed, 0 failed`);
  });

  it('exits 1 and prints FAIL on the row of the deliberately wrong case only', () => {
    const { status, stdout } = rhythmLedger(['verify', 'tests/cli/fixtures/failing-cases.csv']);
    expect(status).toBe(1);
    const failures = stdout.split('\n').filter((l) => l.endsWith('FAIL'));
    // Example F's Bazett QTc is 581.38 ms (Bazett 1920, worked example F from the formulas); the fixture expects 560.15.
    expect(failures).toHaveLength(1);
    expect(failures[0]).toMatch(/^4\s+example-F-mixed-up\s+qtc_bazett_ms\s+560\.15\s+581\.378\s+±0\.01 ms\s+FAIL$/);
    expect(lastLine(stdout)).toBe('3 cases, 11 checks passed, 1 failed');
  });

  it('exits 2 for a malformed row, naming the row and the column', () => {
    const { status, stdout, stderr } = rhythmLedger(['verify', 'tests/cli/fixtures/malformed-cases.csv']);
    expect(status).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toContain("row 3, column rr_small_boxes: count 2 '2O' is not a number");
  });
});

describe('rhythm-ledger help', () => {
  it('lists the commands with --help and exits 0', () => {
    const { status, stdout } = rhythmLedger(['--help']);
    expect(status).toBe(0);
    expect(stdout).toMatch(/^Usage: rhythm-ledger <command>/);
    for (const command of ['analyze', 'verify', 'admin']) expect(stdout).toMatch(new RegExp(`^  ${command} `, 'm'));
  });

  it('refuses an unknown command with exit code 2', () => {
    const { status, stderr } = rhythmLedger(['analyse-all']);
    expect(status).toBe(2);
    expect(stderr).toContain("unknown command 'analyse-all'");
  });

  it('hands admin to src/cli/admin.ts when it exists, and says it is missing otherwise', () => {
    const { status, stderr } = rhythmLedger(['admin', '--help']);
    if (existsSync(join(repoRoot, 'src/cli/admin.ts'))) {
      expect(status).toBe(0);
    } else {
      expect(status).toBe(2);
      expect(stderr).toContain('admin commands are not installed');
    }
  });
});

