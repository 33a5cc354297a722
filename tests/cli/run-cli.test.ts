import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../src/cli/cli-io.ts';
import { runCli } from '../../src/cli/main.ts';

/** An in-memory stdin, file system, stdout and stderr, so commands run in-process. */
function memoryIo(options: { stdin?: string; stdinIsTerminal?: boolean; files?: Record<string, string> } = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdinIsTerminal: options.stdinIsTerminal ?? false,
    readStdin: async () => options.stdin ?? '',
    readTextFile: async (path) => {
      const text = options.files?.[path];
      if (text === undefined) throw new Error(`ENOENT: no such file or directory, open '${path}'`);
      return text;
    },
    writeOut: (text) => out.push(text),
    writeErr: (text) => err.push(text),
  };
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

describe('runCli analyze', () => {
  it('reads a read from a named file and shows the wide-QRS adjustment of example I', async () => {
    // Example I: QT 480, QRS 160, R-R 800 ms; QT - 0.5 x QRS = 400, by Fridericia 430.89; JT 320, JTc 344.71 (Bogossian et al. 2014; Fridericia 1920).
    const m = memoryIo({ files: { 'read.json': JSON.stringify({ paperSpeedMmPerS: 25, rrSmallBoxes: [20], qrsSmallBoxes: 4, qtSmallBoxes: 12, sex: 'male' }) } });
    expect(await runCli(['analyze', 'read.json'], m.io)).toBe(0);
    const report = JSON.parse(m.stdout());
    expect(report.qtc.wideQrs.modifiedQtcMs).toBeCloseTo(430.89, 2);
    expect(report.qtc.wideQrs.jtcMs).toBeCloseTo(344.71, 2);
    expect(report.qtc.forFlags.basis).toBe('modified-qt');
    expect(report.display).toMatchObject({ qrsMs: 160, adjustedQtMs: 400, adjustedQtcMs: 431, jtMs: 320, jtcMs: 345, qtcForFlagsMs: 431 });
    expect(report.flags.map((f: { code: string }) => f.code)).toEqual(['qrs-wide']);
  });

  it('reports null display figures for what the read does not hold', async () => {
    // Six-second method: 8 QRS x 10 = 80 bpm (nursing and teaching texts).
    const m = memoryIo({ stdin: '{"paperSpeedMmPerS": 25, "sixSecondQrsCount": 8}' });
    expect(await runCli(['analyze'], m.io)).toBe(0);
    expect(JSON.parse(m.stdout()).display).toMatchObject({ rateBpm: 80, meanRrMs: null, prMs: null, qtMs: null, qtcBazettMs: null, jtMs: null });
  });

  it('refuses an out-of-range count with its allowed range in boxes', async () => {
    const m = memoryIo({ stdin: '{"paperSpeedMmPerS": 25, "rrSmallBoxes": [2]}' });
    expect(await runCli(['analyze'], m.io)).toBe(2);
    // 150-6000 ms at 40 ms per small box is 3.75-150 small boxes (plausibility limits, common practice, no source).
    expect(JSON.parse(m.stdout()).errors).toEqual([expect.objectContaining({ field: 'rrSmallBoxes[0]', min: 3.75, max: 150 })]);
    expect(m.stderr()).toContain('rrSmallBoxes[0] must be between 3.75 and 150 small boxes');
  });

  it('refuses empty input, a JSON list and a misspelt field, each naming the field', async () => {
    const empty = memoryIo({ stdin: ' \n' });
    expect(await runCli(['analyze'], empty.io)).toBe(2);
    expect(JSON.parse(empty.stdout()).errors[0]).toMatchObject({ field: 'input', message: expect.stringContaining('input is empty') });

    const list = memoryIo({ stdin: '[25, 20]' });
    expect(await runCli(['analyze'], list.io)).toBe(2);
    expect(JSON.parse(list.stdout()).errors[0].field).toBe('input');

    const misspelt = memoryIo({ stdin: '{"paperSpeedMmPerS": 25, "rrSmallBoxes": [20], "qtSmalBoxes": 10}' });
    expect(await runCli(['analyze'], misspelt.io)).toBe(2);
    expect(JSON.parse(misspelt.stdout()).errors[0].message).toContain('qtSmalBoxes');
  });

  it('asks for a read rather than waiting when stdin is a terminal', async () => {
    const m = memoryIo({ stdinIsTerminal: true });
    expect(await runCli(['analyze'], m.io)).toBe(2);
    expect(m.stderr()).toContain('no read given');
  });

  it('refuses an unknown option and a second file', async () => {
    expect(await runCli(['analyze', '--pretty'], memoryIo().io)).toBe(2);
    expect(await runCli(['analyze', 'a.json', 'b.json'], memoryIo().io)).toBe(2);
  });
});

describe('runCli verify', () => {
  const cases = 'case_id,paper_speed_mm_per_s,rr_small_boxes,expect_rate_bpm,expect_flags\nslow,25,30,50,none\n';

  it("applies a unit's policy file", async () => {
    // 1500 / 30 small boxes = 50 bpm: below a 60 bpm limit, not below a unit's 50 bpm limit (Kusumoto et al. 2018).
    const files = { 'cases.csv': cases, 'policy.json': JSON.stringify({ thresholds: { rateLowBpm: 50 } }) };
    const withoutPolicy = memoryIo({ files });
    expect(await runCli(['verify', 'cases.csv'], withoutPolicy.io)).toBe(1);
    expect(withoutPolicy.stdout()).toMatch(/flags\s+none\s+rate-low\s+same set\s+FAIL/);
    const withPolicy = memoryIo({ files });
    expect(await runCli(['verify', 'cases.csv', '--policy', 'policy.json'], withPolicy.io)).toBe(0);
    expect(withPolicy.stdout().trimEnd().split('\n').at(-1)).toBe('1 cases, 2 checks passed, 0 failed');
  });

  it('refuses a policy with a misspelt limit, naming it', async () => {
    const m = memoryIo({ files: { 'cases.csv': cases, 'policy.json': JSON.stringify({ thresholds: { rateLowBmp: 50 } }) } });
    expect(await runCli(['verify', 'cases.csv', '--policy', 'policy.json'], m.io)).toBe(2);
    expect(JSON.parse(m.stdout()).errors[0].field).toMatch(/^policy\.thresholds/);
  });

  it('exits 2 for a file that cannot be read, or none named', async () => {
    const missing = memoryIo();
    expect(await runCli(['verify', 'no-such.csv'], missing.io)).toBe(2);
    expect(missing.stderr()).toContain('cannot read no-such.csv');
    const none = memoryIo();
    expect(await runCli(['verify'], none.io)).toBe(2);
    expect(none.stderr()).toContain('name the case file');
  });

  it('exits 2, naming row and column, when a read is refused that the case did not expect', async () => {
    const m = memoryIo({ files: { 'cases.csv': 'case_id,paper_speed_mm_per_s,rr_small_boxes,qt_small_boxes,expect_qt_ms\nlong-qt,25,10,12,480\n' } });
    expect(await runCli(['verify', 'cases.csv'], m.io)).toBe(2);
    expect(m.stdout()).toBe('');
    expect(m.stderr()).toContain('row 2, column qt_small_boxes: the read is refused: qtSmallBoxes (12) must be shorter than the R-R');
  });
});

describe('runCli help', () => {
  it('gives each command its own help and exits 0', async () => {
    const analyze = memoryIo();
    expect(await runCli(['analyze', '--help'], analyze.io)).toBe(0);
    expect(analyze.stdout()).toMatch(/^Usage: rhythm-ledger analyze/);
    const verify = memoryIo();
    expect(await runCli(['help', 'verify'], verify.io)).toBe(0);
    expect(verify.stdout()).toMatch(/^Usage: rhythm-ledger verify CASES\.csv/);
    expect(verify.stdout()).toContain('expect_qtc_fridericia_ms');
  });

  it('prints the usage on stderr and exits 2 when no command is given', async () => {
    const m = memoryIo();
    expect(await runCli([], m.io)).toBe(2);
    expect(m.stderr()).toMatch(/^Usage: rhythm-ledger <command>/);
  });

  it('prints the core version', async () => {
    const m = memoryIo();
    expect(await runCli(['--version'], m.io)).toBe(0);
    expect(m.stdout()).toMatch(/^rhythm-ledger core \d+\.\d+\.\d+\n$/);
  });

  it('does not treat an inherited object property as a command', async () => {
    const m = memoryIo();
    expect(await runCli(['toString'], m.io)).toBe(2);
    expect(m.stderr()).toContain("unknown command 'toString'");
  });
});
