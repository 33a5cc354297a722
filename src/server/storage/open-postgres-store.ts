import { Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import type { DatabaseSchema } from './database-schema.ts';
import { KyselyStore } from './kysely-store.ts';
import { migrateToLatest } from './migrations.ts';

const int8Oid = 20;

/** Opens a pool on a PostgreSQL database and brings its schema up to date (safe when several servers start at once). */
export async function openPostgresStore(connectionString: string, options: { maxConnections?: number } = {}): Promise<KyselyStore> {
  const pool = new pg.Pool({
    connectionString,
    max: options.maxConnections ?? 10,
    // Millisecond times and counts fit a JS number exactly (below 2^53); read int8 as number, not string.
    types: { getTypeParser: ((oid: number, format?: 'text' | 'binary') => (oid === int8Oid ? (v: string) => Number(v) : pg.types.getTypeParser(oid, format ?? 'text'))) as typeof pg.types.getTypeParser },
  });
  const db = new Kysely<DatabaseSchema>({ dialect: new PostgresDialect({ pool }) });
  try {
    await migrateToLatest(db, 'postgres');
  } catch (error) {
    await db.destroy();
    throw error;
  }
  return new KyselyStore(db, 'postgres');
}
