import { randomUUID } from 'node:crypto';
import { Agent, request } from 'node:http';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import Database from 'better-sqlite3';
import pg from 'pg';
import type { ReadAnalysis } from '../../src/core/analyze-read.ts';
import { analyzeReadOrThrow } from '../../src/core/analyze-read.ts';
import { readInputFor } from '../../src/core/read-derivation.ts';
import type { SignedRead, Stay } from '../../src/core/records.ts';
import { createAccount } from '../../src/server/accounts/unit-setup.ts';
import { openPostgresStore } from '../../src/server/storage/open-postgres-store.ts';
import { sqliteFileName } from '../../src/server/storage/open-store.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import type { Store } from '../../src/server/storage/store.ts';
import type { ChildServer } from '../server/child-server.ts';
import { HttpTablet, seedUnit, startChildServer } from '../server/child-server.ts';
import { changeOf, demoBed, demoRead, demoStay, demoUnit } from '../server/fixtures.ts';
import { testPassword, testPasswordLogN } from '../server/test-app.ts';
import { createThrowawayPostgres, postgresUnavailableReason } from '../server/test-databases.ts';
import { formatCount, formatRatio, formatTable } from './bench-helpers.ts';

/**
 * Unit server figures, on SQLite and on PostgreSQL, against a real server process on loopback:
 * push throughput against raw inserts of the same rows into the same database (the ratio is the
 * cost of validation, derivation, idempotency, audit and HTTP), and push and pull latency with
 * 100 tablets syncing at once.
 */

const batchSize = 200;
const measuredBatches = 10;
const tablets = 100;
const concurrentSeconds = 8;

interface StorageUnderTest {
  kind: 'sqlite' | 'postgres';
  serverEnv: Record<string, string>;
  openStore(): Promise<Store>;
  /** Inserts read rows and their change-log rows straight into the database, `batchSize` per transaction. */
  rawInsert(unitId: string, rows: Array<{ read: SignedRead; analysis: ReadAnalysis }>): Promise<number>;
  dispose(): Promise<void>;
}

function readRowValues(unitId: string, read: SignedRead, analysis: ReadAnalysis, seq: number, atMs: number): unknown[] {
  return [read.id, unitId, read.stayId, read.authorId, read.stripTimeMs, JSON.stringify(read), JSON.stringify(analysis), analysis.coreVersion, seq, atMs];
}
function logRowValues(unitId: string, read: SignedRead, analysis: ReadAnalysis, seq: number, atMs: number): unknown[] {
  return [unitId, seq, randomUUID(), 'read.sign', read.id, JSON.stringify(read), JSON.stringify(analysis), analysis.coreVersion, atMs, atMs, read.authorId, null];
}
const readColumns = 'id, unit_id, stay_id, author_id, strip_time_ms, record_json, analysis_json, core_version, seq, server_time_ms';
const logColumns = 'unit_id, seq, change_id, kind, record_id, record_json, derived_json, core_version, server_time_ms, device_time_ms, user_id, device_id';

function sqliteUnderTest(): StorageUnderTest {
  const dataDir = mkdtempSync(join(tmpdir(), 'rl-bench-'));
  const file = join(dataDir, sqliteFileName);
  return {
    kind: 'sqlite',
    serverEnv: { DATA_DIR: dataDir },
    openStore: () => openSqliteStore(file),
    async rawInsert(unitId, rows) {
      const db = new Database(file);
      db.pragma('journal_mode = WAL');
      db.pragma('synchronous = FULL');
      const insertRead = db.prepare(`insert into reads (${readColumns}) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`);
      const insertLog = db.prepare(`insert into change_log (${logColumns}) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`);
      const started = performance.now();
      for (let i = 0; i < rows.length; i += batchSize) {
        db.transaction(() => {
          rows.slice(i, i + batchSize).forEach(({ read, analysis }, j) => {
            insertRead.run(readRowValues(unitId, read, analysis, i + j + 1, Date.now()));
            insertLog.run(logRowValues(unitId, read, analysis, i + j + 1, Date.now()));
          });
        })();
      }
      const ms = performance.now() - started;
      db.close();
      return ms;
    },
    async dispose() {
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

async function postgresUnderTest(): Promise<StorageUnderTest> {
  const database = await createThrowawayPostgres();
  return {
    kind: 'postgres',
    serverEnv: { DATABASE_URL: database.url },
    openStore: () => openPostgresStore(database.url, { maxConnections: 2 }),
    async rawInsert(unitId, rows) {
      const client = new pg.Client({ connectionString: database.url });
      await client.connect();
      const started = performance.now();
      for (let i = 0; i < rows.length; i += batchSize) {
        await client.query('begin');
        for (const [j, { read, analysis }] of rows.slice(i, i + batchSize).entries()) {
          await client.query(`insert into reads (${readColumns}) values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10)`, readRowValues(unitId, read, analysis, i + j + 1, Date.now()));
          await client.query(`insert into change_log (${logColumns}) values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)`, logRowValues(unitId, read, analysis, i + j + 1, Date.now()));
        }
        await client.query('commit');
      }
      const ms = performance.now() - started;
      await client.end();
      return ms;
    },
    dispose: database.drop,
  };
}

/** A lean HTTP client for the load: keep-alive sockets, and pull answers read for their cursor only, so the load generator does not starve the server of CPU. */
const keepAlive = new Agent({ keepAlive: true, maxSockets: Infinity });
function send(baseUrl: string, method: 'GET' | 'POST', path: string, headers: Record<string, string>, body?: string): Promise<{ status: number; text: string }> {
  return new Promise((resolvePromise, reject) => {
    const req = request(`${baseUrl}${path}`, { method, headers, agent: keepAlive }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolvePromise({ status: res.statusCode ?? 0, text: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end(body);
  });
}
const tailPattern = /"cursor":"(\d+)","hasMore":(true|false)\}$/;

const percentile = (sortedMs: number[], p: number) => sortedMs[Math.min(sortedMs.length - 1, Math.max(0, Math.ceil(p * sortedMs.length) - 1))] ?? Number.NaN;
const ms = (value: number) => `${value < 10 ? value.toFixed(1) : Math.round(value)} ms`;

async function benchOne(storage: StorageUnderTest): Promise<string[][]> {
  const store = await storage.openStore();
  const seeded = await seedUnit(store);
  const nurses = [];
  for (let i = 0; i < tablets; i += 1) {
    nurses.push(await createAccount(store, { unitId: seeded.unit.id, username: `bench-nurse-${i}`, name: `Nurse ${i}`, role: 'nurse', password: testPassword }, Date.now(), testPasswordLogN));
  }
  const rawUnit = demoUnit({ name: 'Raw insert baseline' });
  await store.createUnit(rawUnit, Date.now());
  await store.close();

  let server: ChildServer | undefined;
  try {
    server = await startChildServer({ ...storage.serverEnv, LOG_LEVEL: 'error' });
    const admin = new HttpTablet(server.url, seeded.deviceToken);
    await admin.signIn(seeded.admin.username);
    const beds = Array.from({ length: tablets }, (_, i) => demoBed(seeded.unit.id, `Bed ${i + 1}`, { sortOrder: i }));
    const stays = beds.map((bed) => demoStay(seeded.unit.id, bed.id));
    await admin.push([...beds.map((b) => changeOf('bed.put', b)), ...stays.map((s) => changeOf('stay.put', s))]);

    // Push throughput: one tablet sending full batches, one after another (after one warm-up batch).
    const readAt = (n: number) => demoRead(stays[n % tablets] as Stay, seeded.admin.id, { stripTimeMs: (stays[0] as Stay).startMs + n * 60_000 });
    await admin.push(Array.from({ length: batchSize }, (_, i) => changeOf('read.sign', readAt(i))));
    const measured = Array.from({ length: measuredBatches * batchSize }, (_, i) => readAt(batchSize + i));
    const pushStarted = performance.now();
    for (let i = 0; i < measured.length; i += batchSize) {
      const results = await admin.push(measured.slice(i, i + batchSize).map((r) => changeOf('read.sign', r)));
      if (!results.every((r) => r.status === 'accepted')) throw new Error('a bench read was refused');
    }
    const pushReadsPerS = measured.length / ((performance.now() - pushStarted) / 1000);

    // Raw inserts of the same rows (new ids, so they do not collide) into the same database, while the server idles.
    const stayById = new Map(stays.map((s) => [s.id, s]));
    const rawRows = measured.map((read) => ({
      read: { ...read, id: randomUUID(), unitId: rawUnit.id },
      analysis: analyzeReadOrThrow(readInputFor(read.counts, stayById.get(read.stayId) as Stay)),
    }));
    const rawReadsPerS = rawRows.length / ((await storage.rawInsert(rawUnit.id, rawRows)) / 1000);

    // 100 tablets at once, each pushing one read and pulling what changed since its cursor, for a few seconds.
    const clients = await Promise.all(
      nurses.map(async (nurse, i) => {
        const tablet = new HttpTablet((server as ChildServer).url, seeded.deviceToken);
        await tablet.signIn(nurse.username);
        const token = tablet.token;
        const cursor = String((await tablet.pullAll()).at(-1)?.seq ?? 0);
        const headers = { 'content-type': 'application/json', authorization: `Bearer ${token}`, 'x-device-token': seeded.deviceToken };
        return { headers, nurse, stay: stays[i] as Stay, cursor };
      }),
    );
    const baseUrl = server.url;
    const pushLatencies: number[] = [];
    const pullLatencies: number[] = [];
    const stopAt = performance.now() + concurrentSeconds * 1000;
    const loopsStarted = performance.now();
    await Promise.all(
      clients.map(async (client) => {
        let n = 0;
        while (performance.now() < stopAt) {
          const read = demoRead(client.stay, client.nurse.id, { stripTimeMs: client.stay.startMs + 1e9 + n * 60_000 });
          n += 1;
          let started = performance.now();
          const pushed = await send(baseUrl, 'POST', '/api/sync/push', client.headers, JSON.stringify({ changes: [changeOf('read.sign', read)] }));
          pushLatencies.push(performance.now() - started);
          if (pushed.status !== 200 || !pushed.text.includes('"status":"accepted"')) throw new Error(`a bench read was refused: ${pushed.text}`);
          started = performance.now();
          for (let more = true; more; ) {
            const pulled = await send(baseUrl, 'GET', `/api/sync/pull?after=${client.cursor}&limit=500`, client.headers);
            const tail = tailPattern.exec(pulled.text);
            if (pulled.status !== 200 || !tail) throw new Error(`pull answered ${pulled.status}`);
            client.cursor = tail[1] as string;
            more = tail[2] === 'true';
          }
          pullLatencies.push(performance.now() - started);
        }
      }),
    );
    const loopSeconds = (performance.now() - loopsStarted) / 1000;
    pushLatencies.sort((a, b) => a - b);
    pullLatencies.sort((a, b) => a - b);

    const label = storage.kind === 'sqlite' ? 'SQLite' : 'PostgreSQL';
    return [
      [`${label}: push, ${batchSize} reads per batch`, `${formatCount(pushReadsPerS)} reads/s`, `raw inserts ${formatCount(rawReadsPerS)} rows/s`, `push / raw = ${(pushReadsPerS / rawReadsPerS).toFixed(2)} (raw ${formatRatio(rawReadsPerS / pushReadsPerS)} faster)`],
      [`${label}: ${tablets} tablets, push 1 read`, `p50 ${ms(percentile(pushLatencies, 0.5))}`, `p99 ${ms(percentile(pushLatencies, 0.99))}`, `${formatCount(pushLatencies.length / loopSeconds)} pushes/s`],
      [`${label}: ${tablets} tablets, pull after cursor`, `p50 ${ms(percentile(pullLatencies, 0.5))}`, `p99 ${ms(percentile(pullLatencies, 0.99))}`, `${formatCount(pullLatencies.length / loopSeconds)} pulls/s`],
    ];
  } finally {
    await server?.kill('SIGTERM');
  }
}

/** Prints the server figures; PostgreSQL is measured when it answers on 127.0.0.1:5432. */
export async function run(): Promise<void> {
  console.log(`Unit server (a real server process on loopback; ${tablets} simulated tablets for ${concurrentSeconds} s per storage)`);
  const rows: string[][] = [['measure', 'result', 'baseline or p99', 'ratio or rate']];
  const sqlite = sqliteUnderTest();
  try {
    rows.push(...(await benchOne(sqlite)));
  } finally {
    await sqlite.dispose();
  }
  const unavailable = await postgresUnavailableReason();
  if (unavailable) rows.push(['PostgreSQL', 'not measured', unavailable, '']);
  else {
    const postgres = await postgresUnderTest();
    try {
      rows.push(...(await benchOne(postgres)));
    } finally {
      await postgres.dispose();
    }
  }
  console.log(formatTable(rows));
  console.log('  The push ratio is what validation, server-side derivation, idempotency, audit and HTTP cost over bare inserts of the same rows.');
}
