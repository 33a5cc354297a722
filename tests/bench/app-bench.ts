// Tablet app figures, each against a baseline measured in the same run:
// 1. the app shell's initial JS against a bare Preact + Dexie page built by the same Vite config;
// 2. signing a read (read + outbox + draft removal in one transaction, core derivation) against a raw put of the same rows;
// 3. typing a count to seeing the figures, against a 16.7 ms frame;
// 4. the beds board with 12, 24 and 48 beds x 7 days of q4h reads (and 48 x 1 day), rendered in happy-dom.
// The tablet store runs on fake-indexeddb in Node (installed globally; no other bench uses IndexedDB).
import 'fake-indexeddb/auto';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { gzipSync } from 'node:zlib';
import type { Manifest } from 'vite';
import type { ReadDraftForm } from '../../src/store/read-draft.ts';
import { formatCount, formatMicroseconds, formatRatio, formatTable, measureThroughput } from './bench-helpers.ts';
import { benchUnit, benchWard } from './app-bench/bench-ward.ts';

const frameBudgetMs = 1000 / 60;
const benchNowMs = Date.parse('2026-03-10T10:30:00Z');

interface ChunkSizes {
  files: string[];
  rawBytes: number;
  gzipBytes: number;
}

/** The entry chunk and every chunk it imports statically: what the page must load before it can run. */
function initialJs(outDir: string, entryKey: string): ChunkSizes {
  const manifest = JSON.parse(readFileSync(join(outDir, '.vite', 'manifest.json'), 'utf8')) as Manifest;
  const seen = new Set<string>();
  const visit = (key: string) => {
    const chunk = manifest[key];
    if (!chunk || seen.has(chunk.file)) return;
    seen.add(chunk.file);
    for (const imported of chunk.imports ?? []) visit(imported);
  };
  visit(entryKey);
  if (seen.size === 0) throw new Error(`no entry ${entryKey} in the build manifest of ${outDir}`);
  const files = [...seen];
  const contents = files.map((file) => readFileSync(join(outDir, file)));
  return { files, rawBytes: contents.reduce((sum, c) => sum + c.length, 0), gzipBytes: contents.reduce((sum, c) => sum + gzipSync(c).length, 0) };
}

/** Runs a build with its console output held back (the service worker sub-build logs whatever the log level), shown only if it fails. */
async function quietly<T>(work: () => Promise<T>): Promise<T> {
  const held: string[] = [];
  const write = process.stdout.write.bind(process.stdout);
  const writeError = process.stderr.write.bind(process.stderr);
  const hold = (chunk: unknown) => (held.push(String(chunk)), true);
  process.stdout.write = hold as typeof process.stdout.write;
  process.stderr.write = hold as typeof process.stderr.write;
  try {
    return await work();
  } catch (error) {
    writeError(held.join(''));
    throw error;
  } finally {
    process.stdout.write = write;
    process.stderr.write = writeError;
  }
}

async function appShellSize(): Promise<void> {
  const { build } = await import('vite');
  const appOut = mkdtempSync(join(tmpdir(), 'rl-bench-app-'));
  const bareOut = mkdtempSync(join(tmpdir(), 'rl-bench-bare-'));
  // Vite emits a development build whenever NODE_ENV says so (a test runner sets 'test'); the
  // figures are for what ships.
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    const common = { configFile: 'vite.config.ts', mode: 'production', logLevel: 'silent' as const };
    await quietly(() => build({ ...common, build: { outDir: appOut, emptyOutDir: true, manifest: true } }));
    await quietly(() => build({ ...common, build: { outDir: bareOut, emptyOutDir: true, manifest: true, rolldownOptions: { input: 'tests/bench/app-bench/bare-page.html' } } }));
    const app = initialJs(appOut, 'index.html');
    const bare = initialJs(bareOut, 'tests/bench/app-bench/bare-page.html');
    const appText = app.files.map((f) => readFileSync(join(appOut, f), 'utf8')).join('');
    if (!appText.includes('/sw.js')) throw new Error('the measured app build does not register the service worker: not a production build');
    console.log('App shell: initial JS (entry and its static imports), same Vite config, production mode, gzip level 6');
    console.log(
      formatTable([
        ['page', 'files', 'raw bytes', 'gzip bytes'],
        ['tablet app shell', String(app.files.length), formatCount(app.rawBytes), formatCount(app.gzipBytes)],
        ['baseline: bare Preact + Dexie page', String(bare.files.length), formatCount(bare.rawBytes), formatCount(bare.gzipBytes)],
        ['ratio app / bare', '', formatRatio(app.rawBytes / bare.rawBytes), formatRatio(app.gzipBytes / bare.gzipBytes)],
      ]),
    );
  } finally {
    if (nodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = nodeEnv;
    rmSync(appOut, { recursive: true, force: true });
    rmSync(bareOut, { recursive: true, force: true });
  }
}

async function saveRead(): Promise<void> {
  const { RhythmDb } = await import('../../src/store/db.ts');
  const { signRead } = await import('../../src/store/sign-read.ts');
  type StoredRead = import('../../src/store/db.ts').StoredRead;
  const unit = benchUnit(benchNowMs);
  const author = { id: 'clin-bench-nurse', name: 'Bench Nurse' };

  // Signs every read of the ward in strip-time order, as the nurses would have; returns the stored rows.
  const signAll = async (name: string, bedCount: number): Promise<{ rows: StoredRead[]; ms: number }> => {
    const ward = benchWard(unit, bedCount, 7, benchNowMs);
    const db = new RhythmDb(name);
    await db.units.put(unit);
    await db.beds.bulkPut(ward.map((w) => w.bed));
    await db.stays.bulkPut(ward.map((w) => w.stay));
    const stayById = new Map(ward.map((w) => [w.stay.id, w.stay]));
    const reads = ward.flatMap((w) => w.reads).sort((a, b) => a.stripTimeMs - b.stripTimeMs);
    const rows: StoredRead[] = [];
    const start = performance.now();
    for (const read of reads) {
      rows.push(
        await signRead(db, {
          unit,
          stay: stayById.get(read.stayId)!,
          stripTimeMs: read.stripTimeMs,
          counts: read.counts,
          reason: read.reason,
          author,
          deviceId: read.deviceId,
          enteredAtMs: read.enteredAtMs,
          nowMs: read.signedAtMs,
          id: read.id,
        }),
      );
    }
    const ms = performance.now() - start;
    db.close();
    return { rows, ms };
  };
  const putAll = async (name: string, rows: readonly StoredRead[]): Promise<number> => {
    const db = new RhythmDb(name);
    await db.open();
    const start = performance.now();
    for (const row of rows) await db.reads.put(row);
    const ms = performance.now() - start;
    db.close();
    return ms;
  };

  const warm = await signAll('bench-sign-warmup', 2);
  await putAll('bench-put-warmup', warm.rows);
  const signed = await signAll('bench-sign', 12);
  const rawMs = await putAll('bench-put', signed.rows);
  const count = signed.rows.length;
  console.log(`Save a read: ${count} reads (12 beds x 7 days of q4h) on fake-indexeddb in Node (a stand-in: browser IndexedDB timings differ)`);
  console.log(
    formatTable([
      ['write', 'per read', 'all reads'],
      ['signRead: validate, derive (core), read + outbox + draft in one transaction', `${(signed.ms / count).toFixed(2)} ms`, `${Math.round(signed.ms)} ms`],
      ['baseline: raw db.reads.put of the same rows', `${(rawMs / count).toFixed(2)} ms`, `${Math.round(rawMs)} ms`],
      ['ratio sign / raw put', formatRatio(signed.ms / rawMs), ''],
    ]),
  );
}

async function typingToFigures(): Promise<void> {
  const { liveRead, newReadForm } = await import('../../src/app/read-form-values.ts');
  const { signingErrors } = await import('../../src/app/read-form-checks.ts');
  const { unitPolicyOf } = await import('../../src/store/unit-policy-of.ts');
  const unit = benchUnit(benchNowMs);
  const policy = unitPolicyOf(unit);
  const stay = benchWard(unit, 1, 1, benchNowMs)[0]!.stay;
  // What the read form does per keystroke: the counts as typed through the core, then the signing checks.
  const keystrokes: Array<(f: ReadDraftForm) => ReadDraftForm> = [
    (f) => ({ ...f, rrSmallBoxes: ['2'] }),
    (f) => ({ ...f, rrSmallBoxes: ['20'] }),
    (f) => ({ ...f, prSmallBoxes: '4' }),
    (f) => ({ ...f, qrsSmallBoxes: '2' }),
    (f) => ({ ...f, qtSmallBoxes: '1' }),
    (f) => ({ ...f, qtSmallBoxes: '13' }),
  ];
  const typing = await measureThroughput(() => {
    let form = newReadForm(unit, benchNowMs);
    let sink = 0;
    for (const key of keystrokes) {
      form = key(form);
      const live = liveRead(form, stay, undefined, policy);
      sink += signingErrors(form, live, unit.timeZone, benchNowMs).length + (live.analysis?.flags.length ?? 0);
    }
    return sink;
  }, keystrokes.length);
  const perKeyMs = typing.microsecondsPerItem / 1000;
  console.log('Typing to figures: per keystroke, the form through the core (analyzeUnknownRead) and the signing checks');
  console.log(formatTable([
    ['work per keystroke', 'time', 'share of a 16.7 ms frame'],
    ['core derivation + checks (Node)', formatMicroseconds(typing.microsecondsPerItem), `${((perKeyMs / frameBudgetMs) * 100).toFixed(1)}%`],
  ]));
}

interface BoardTiming {
  bedCount: number;
  days: number;
  readCount: number;
  queryMs: number;
  rowsMs: number;
  mountMs: number;
  rerenderMs: number;
}

/** Runs board-render.tsx in its own process (its DOM globals and JSX settings stay there) and reads its JSON line. */
function renderInHappyDom(): Promise<{ boards: BoardTiming[]; typing: { keystrokes: number; medianMs: number; p99Ms: number } }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'tests/bench/app-bench/board-render.tsx'], {
      env: { ...process.env, TSX_TSCONFIG_PATH: 'tsconfig.base.json', NODE_ENV: 'production' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (err += c.toString()));
    child.on('exit', (code) => {
      const line = out.split('\n').find((l) => l.startsWith('BENCH-RESULT '));
      if (code !== 0 || !line) reject(new Error(`board render exited with ${code}:\n${out}\n${err}`));
      else resolve(JSON.parse(line.slice('BENCH-RESULT '.length)));
    });
  });
}

async function boardAndFormRender(): Promise<void> {
  const { boards, typing } = await renderInHappyDom();
  const twelve = boards.find((b) => b.bedCount === 12)!;
  const ms = (v: number) => `${v.toFixed(1)} ms`;
  console.log('Beds board in happy-dom over fake-indexeddb (both slower than a browser; compare the rows with each other), median of 9');
  console.log(
    formatTable([
      ['beds x days', 'reads stored', 'store query', 'board rows (core)', 'open to cards shown', 'growth vs 12 beds', 're-render with data'],
      ...boards.map((b) => [
        `${b.bedCount} x ${b.days}`,
        formatCount(b.readCount),
        ms(b.queryMs),
        ms(b.rowsMs),
        ms(b.mountMs),
        formatRatio(b.mountMs / twelve.mountMs),
        ms(b.rerenderMs),
      ]),
    ]),
  );
  console.log('  (the board reads only the latest two reads per stay, so days of history should not change it; beds should grow it about linearly)');
  console.log(
    `Typing to figures with the figures panel and banners re-rendered (happy-dom): median ${ms(typing.medianMs)}, p99 ${ms(typing.p99Ms)} per keystroke over ${typing.keystrokes} keystrokes; frame budget ${ms(frameBudgetMs)}`,
  );
}

/** Prints the tablet app's figures. */
export async function run(): Promise<void> {
  console.log('Tablet app');
  const parts: Array<[string, () => Promise<void>]> = [
    ['app shell', appShellSize],
    ['save a read', saveRead],
    ['typing', typingToFigures],
    ['board render', boardAndFormRender],
  ];
  for (const [name, part] of parts) {
    const start = performance.now();
    await part();
    console.log(`  (${name}: ${((performance.now() - start) / 1000).toFixed(1)} s)`);
    console.log('');
  }
}
