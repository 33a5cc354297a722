import { describe } from 'vitest';
import { runStoreSuite } from './store.case.ts';
import { openTestSqlite } from './test-databases.ts';

// The storage contract on the embedded SQLite file (WAL, synchronous FULL).
describe('SQLite store', () => {
  runStoreSuite({ newStore: openTestSqlite });
});
