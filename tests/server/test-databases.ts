import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import pg from 'pg';
import { describe, it } from 'vitest';
import type { Store } from '../../src/server/storage/store.ts';
import { openPostgresStore } from '../../src/server/storage/open-postgres-store.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';

/** A store opened for one test, with a side door for raw SQL (to prove what the store itself refuses to do). */
export interface TestStore {
  store: Store;
  rawExecute(sqlText: string): Promise<void>;
  dispose(): Promise<void>;
}

export const postgresAdminUrl = process.env.TEST_POSTGRES_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';

/** Null when PostgreSQL answers on 127.0.0.1:5432; otherwise the reason it cannot be used. */
export async function postgresUnavailableReason(): Promise<string | null> {
  const client = new pg.Client({ connectionString: postgresAdminUrl, connectionTimeoutMillis: 3000 });
  try {
    await client.connect();
    await client.query('select 1');
    return null;
  } catch (error) {
    return `PostgreSQL is not reachable at ${postgresAdminUrl}: ${error instanceof Error ? error.message : String(error)}`;
  } finally {
    await client.end().catch(() => undefined);
  }
}

/** Creates a throwaway database rl_test_<random>; the returned drop() removes it. */
export async function createThrowawayPostgres(): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `rl_test_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: postgresAdminUrl });
  await admin.connect();
  await admin.query(`create database ${name}`);
  await admin.end();
  const url = new URL(postgresAdminUrl);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const client = new pg.Client({ connectionString: postgresAdminUrl });
      await client.connect();
      await client.query(`drop database if exists ${name} with (force)`);
      await client.end();
    },
  };
}

/** A fresh SQLite store in a temporary folder (a real file, so WAL and FULL sync are exercised). */
export async function openTestSqlite(): Promise<TestStore> {
  const dir = mkdtempSync(join(tmpdir(), 'rl-store-'));
  const file = join(dir, 'rhythm-ledger.sqlite');
  const store = await openSqliteStore(file);
  return {
    store,
    async rawExecute(sqlText) {
      const db = new Database(file);
      try {
        db.exec(sqlText);
      } finally {
        db.close();
      }
    },
    async dispose() {
      await store.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A fresh PostgreSQL store on its own throwaway database. */
export async function openTestPostgres(): Promise<TestStore> {
  const database = await createThrowawayPostgres();
  const store = await openPostgresStore(database.url, { maxConnections: 4 });
  return {
    store,
    async rawExecute(sqlText) {
      const client = new pg.Client({ connectionString: database.url });
      await client.connect();
      try {
        await client.query(sqlText);
      } finally {
        await client.end();
      }
    },
    async dispose() {
      await store.close();
      await database.drop();
    },
  };
}

/** Whether a PostgreSQL suite runs here: 'run', 'skip' (developer machine without it) or 'fail' (CI=true without it). */
export interface PostgresGate {
  decision: 'run' | 'skip' | 'fail';
  reason: string;
}

export async function postgresGate(): Promise<PostgresGate> {
  const reason = await postgresUnavailableReason();
  if (reason === null) return { decision: 'run', reason: 'PostgreSQL answers' };
  if (process.env.CI === 'true') return { decision: 'fail', reason: `CI=true but ${reason}` };
  console.warn(`Skipping PostgreSQL tests: ${reason}`);
  return { decision: 'skip', reason };
}

/** describe() that runs with PostgreSQL, skips without it locally, and fails without it under CI=true. */
export function describeWithPostgres(name: string, gate: PostgresGate, body: () => void): void {
  if (gate.decision === 'fail') {
    describe(name, () => {
      it('needs PostgreSQL on 127.0.0.1:5432 under CI=true', () => {
        throw new Error(gate.reason);
      });
    });
    return;
  }
  describe.skipIf(gate.decision === 'skip')(name, body);
}
