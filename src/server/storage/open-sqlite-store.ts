import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import Database from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import type { DatabaseSchema } from './database-schema.ts';
import { KyselyStore } from './kysely-store.ts';
import { migrateToLatest } from './migrations.ts';

/** Opens (creating if needed) the embedded SQLite database and brings its schema up to date. `:memory:` is allowed for tests. */
export async function openSqliteStore(filePath: string): Promise<KyselyStore> {
  if (filePath !== ':memory:') mkdirSync(dirname(filePath), { recursive: true });
  const database = new Database(filePath);
  // WAL lets pulls read while a push writes; FULL syncs the log at every commit, so an
  // acknowledged push survives a power cut, not only a process crash.
  database.pragma('journal_mode = WAL');
  database.pragma('synchronous = FULL');
  database.pragma('foreign_keys = ON');
  database.pragma('busy_timeout = 5000');
  const db = new Kysely<DatabaseSchema>({ dialect: new SqliteDialect({ database }) });
  await migrateToLatest(db, 'sqlite');
  return new KyselyStore(db, 'sqlite');
}
