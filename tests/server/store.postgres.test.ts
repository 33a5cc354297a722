import { runStoreSuite } from './store.case.ts';
import { describeWithPostgres, openTestPostgres, postgresGate } from './test-databases.ts';

// The same storage contract on PostgreSQL, one throwaway database per test.
const gate = await postgresGate();
describeWithPostgres('PostgreSQL store', gate, () => {
  runStoreSuite({ newStore: openTestPostgres });
});
