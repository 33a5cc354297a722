import { afterAll, expect, it } from 'vitest';
import type { Stay } from '../../src/core/records.ts';
import { createAccount } from '../../src/server/accounts/unit-setup.ts';
import { openPostgresStore } from '../../src/server/storage/open-postgres-store.ts';
import type { ChildServer } from './child-server.ts';
import { HttpTablet, seedUnit, startChildServer } from './child-server.ts';
import { changeOf, demoBed, demoRead, demoStay } from './fixtures.ts';
import { testPassword, testPasswordLogN } from './test-app.ts';
import { createThrowawayPostgres, describeWithPostgres, postgresGate } from './test-databases.ts';

const tabletsCount = 6;
const batchesPerTablet = 12;
const readsPerBatch = 8;

const gate = await postgresGate();
describeWithPostgres('fault: two server processes on one PostgreSQL, concurrent pushes and pulls', gate, () => {
  const servers: ChildServer[] = [];
  let dropDatabase: (() => Promise<void>) | undefined;
  afterAll(async () => {
    await Promise.all(servers.map((s) => s.kill()));
    await dropDatabase?.();
  });

  it('a puller looping across both servers sees every change exactly once, in order, with no gap', async () => {
    const database = await createThrowawayPostgres();
    dropDatabase = database.drop;
    const store = await openPostgresStore(database.url, { maxConnections: 2 });
    const seeded = await seedUnit(store);
    const nurses = [];
    for (let i = 0; i < tabletsCount; i += 1) {
      nurses.push(await createAccount(store, { unitId: seeded.unit.id, username: `nurse-${i}`, name: `Nurse ${i}`, role: 'nurse', password: testPassword }, Date.now(), testPasswordLogN));
    }
    await store.close();

    servers.push(await startChildServer({ DATABASE_URL: database.url }), await startChildServer({ DATABASE_URL: database.url }));
    const [a, b] = servers as [ChildServer, ChildServer];
    const admin = new HttpTablet(a.url, seeded.deviceToken);
    await admin.signIn(seeded.admin.username);
    const beds = Array.from({ length: tabletsCount }, (_, i) => demoBed(seeded.unit.id, `Bed ${i + 1}`));
    const stays = beds.map((bed) => demoStay(seeded.unit.id, bed.id));
    await admin.push([...beds.map((x) => changeOf('bed.put', x)), ...stays.map((s) => changeOf('stay.put', s))]);

    // Each tablet alternates between the two servers, as a load balancer would send it.
    const tablets = await Promise.all(
      nurses.map(async (nurse, i) => {
        const tablet = new HttpTablet(i % 2 === 0 ? a.url : b.url, seeded.deviceToken);
        await tablet.signIn(nurse.username);
        return { tablet, nurse, stay: stays[i] as Stay };
      }),
    );
    const pushedReadIds: string[] = [];
    let pushing = true;
    const writers = Promise.all(
      tablets.map(async ({ tablet, nurse, stay }, t) => {
        for (let batch = 0; batch < batchesPerTablet; batch += 1) {
          tablet.baseUrl = (t + batch) % 2 === 0 ? a.url : b.url;
          const changes = Array.from({ length: readsPerBatch }, (_, i) => changeOf('read.sign', demoRead(stay, nurse.id, { stripTimeMs: stay.startMs + (batch * readsPerBatch + i) * 60_000 })));
          pushedReadIds.push(...changes.map((c) => (c.record as { id: string }).id));
          const results = await tablet.push(changes);
          expect(results.every((r) => r.status === 'accepted')).toBe(true);
        }
      }),
    ).finally(() => {
      pushing = false;
    });

    // The puller: small pages, alternating servers, each page must continue exactly where the cursor stood.
    const puller = new HttpTablet(b.url, seeded.deviceToken);
    await puller.signIn(seeded.admin.username);
    const seenSeqs: number[] = [];
    const seenReadIds: string[] = [];
    let cursor = '0';
    let pulls = 0;
    let contiguousPages = 0;
    const pullOnce = async () => {
      puller.baseUrl = pulls % 2 === 0 ? a.url : b.url;
      pulls += 1;
      const page = await puller.pullPage(cursor, 25);
      const expectedSeqs = page.changes.map((_, i) => Number(cursor) + i + 1);
      if (page.changes.map((c) => c.seq).join() === expectedSeqs.join()) contiguousPages += 1;
      seenSeqs.push(...page.changes.map((c) => c.seq));
      seenReadIds.push(...page.changes.filter((c) => c.kind === 'read.sign').map((c) => c.record.id));
      cursor = page.cursor;
      return page;
    };
    while (pushing) await pullOnce();
    await writers;
    while ((await pullOnce()).hasMore);

    const total = 1 + beds.length + stays.length + tabletsCount * batchesPerTablet * readsPerBatch;
    expect(contiguousPages).toBe(pulls);
    expect(seenSeqs).toEqual(Array.from({ length: total }, (_, i) => i + 1));
    expect(new Set(seenReadIds)).toEqual(new Set(pushedReadIds));
    expect([pushedReadIds.length, seenReadIds.length, new Set(seenReadIds).size]).toEqual([576, 576, 576]);
    console.log(`two servers on PostgreSQL: ${pushedReadIds.length} reads pushed by ${tabletsCount} tablets, ${pulls} pulls during the pushes, ${seenSeqs.length} changes seen, no gap, no double`);
  }, 120_000);
});
