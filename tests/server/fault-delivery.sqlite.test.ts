import { describe } from 'vitest';
import { runDeliveryFaults } from './fault-delivery.case.ts';
import { openTestSqlite } from './test-databases.ts';

// Duplicated, reordered and partial pushes, a shift offline and a clock 6 h off, on SQLite.
describe('delivery faults on SQLite', () => {
  runDeliveryFaults({ newStore: openTestSqlite });
});
