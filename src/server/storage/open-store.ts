import { join } from 'node:path';
import type { ServerSettings } from '../settings.ts';
import { openPostgresStore } from './open-postgres-store.ts';
import { openSqliteStore } from './open-sqlite-store.ts';
import type { Store } from './store.ts';

/** The SQLite file inside DATA_DIR. */
export const sqliteFileName = 'rhythm-ledger.sqlite';

/** Opens the store the settings ask for: PostgreSQL when DATABASE_URL is set, otherwise the SQLite file in DATA_DIR. */
export async function openStore(settings: Pick<ServerSettings, 'databaseUrl' | 'dataDir'>): Promise<Store> {
  if (settings.databaseUrl) return openPostgresStore(settings.databaseUrl);
  return openSqliteStore(join(settings.dataDir, sqliteFileName));
}

/** Where the data lives, for the start-up line; a PostgreSQL password is never printed. */
export function describeStorage(settings: Pick<ServerSettings, 'databaseUrl' | 'dataDir'>): string {
  if (!settings.databaseUrl) return `SQLite file ${join(settings.dataDir, sqliteFileName)}`;
  const url = new URL(settings.databaseUrl);
  return `PostgreSQL database ${url.pathname.slice(1) || '(default)'} on ${url.hostname}:${url.port || '5432'}`;
}
