import { runDeliveryFaults } from './fault-delivery.case.ts';
import { describeWithPostgres, openTestPostgres, postgresGate } from './test-databases.ts';

// The same delivery faults on PostgreSQL.
const gate = await postgresGate();
describeWithPostgres('delivery faults on PostgreSQL', gate, () => {
  runDeliveryFaults({ newStore: openTestPostgres });
});
