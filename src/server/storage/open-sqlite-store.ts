import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import Database from 'better-sqlite3';
import type { SqliteDatabase, SqliteStatement } from 'kysely';
import { Kysely, SqliteDialect } from 'kysely';
import type { DatabaseSchema } from './database-schema.ts';
import { KyselyStore } from './kysely-store.ts';
import { migrateToLatest } from './migrations.ts';

/** How many prepared statements to keep; the server issues a few dozen distinct queries. */
const statementCacheSize = 200;

/**
 * Kysely prepares every query afresh; preparing costs about as much as running a small query, so
 * prepared statements are kept by SQL text (SQLite re-prepares them itself if the schema changes).
 */
function withStatementCache(database: Database.Database): SqliteDatabase {
  const cache = new Map<string, SqliteStatement>();
  return {
    close: () => database.close(),
    prepare(sqlText: string): SqliteStatement {
      let statement = cache.get(sqlText);
      if (!statement) {
        statement = database.prepare(sqlText) as unknown as SqliteStatement;
        if (cache.size >= statementCacheSize) cache.delete(cache.keys().next().value as string);
        cache.set(sqlText, statement);
      }
      return statement;
    },
  };
}

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
  const db = new Kysely<DatabaseSchema>({ dialect: new SqliteDialect({ database: withStatementCache(database) }) });
  await migrateToLatest(db, 'sqlite');
  return new KyselyStore(db, 'sqlite');
}
