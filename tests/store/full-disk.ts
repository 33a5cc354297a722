import type { DBCore, DBCoreMutateRequest } from 'dexie';
import type { RhythmDb } from '../../src/store/db.ts';

/** Makes every later write to the given tables fail as a full disk does, optionally wrapped in an AbortError. */
export async function fillDisk(db: RhythmDb, tables: string[], wrapped: boolean): Promise<void> {
  const quota = new DOMException('The quota has been exceeded.', 'QuotaExceededError');
  const failure = wrapped ? Object.assign(new DOMException('Transaction aborted', 'AbortError'), { inner: quota }) : quota;
  // Middleware takes effect when the database opens, as on a tablet whose disk filled between sessions.
  db.close();
  db.use({
    stack: 'dbcore',
    name: 'full-disk',
    create: (down: DBCore) => ({
      ...down,
      table: (name: string) => {
        const table = down.table(name);
        return tables.includes(name) ? { ...table, mutate: (_req: DBCoreMutateRequest) => Promise.reject(failure) } : table;
      },
    }),
  });
  await db.open();
}

