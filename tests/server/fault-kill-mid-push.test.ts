import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Change } from '../../src/core/records.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import { sqliteFileName } from '../../src/server/storage/open-store.ts';
import type { ChildServer } from './child-server.ts';
import { HttpTablet, seedUnit, startChildServer } from './child-server.ts';
import { changeOf, demoBed, demoRead, demoStay } from './fixtures.ts';

const readsPerBatch = 200;
/** When to kill, as a share of how long an uninterrupted push of the same size took: early (reading the body) to late (around the commit). */
const killPoints = [0.1, 0.45, 0.8, 0.97];
const rounds = killPoints.length;

describe('fault: the server process killed in the middle of a push, then restarted', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'rl-kill-'));
  let server: ChildServer | undefined;
  afterAll(async () => {
    await server?.kill();
    rmSync(dataDir, { recursive: true, force: true });
  });

  it('keeps every read exactly once: no batch half-applied, every retry answered, 1,000 reads on the tablet, in the database and in a pull', async () => {
    const store = await openSqliteStore(join(dataDir, sqliteFileName));
    const seeded = await seedUnit(store);
    await store.close();

    server = await startChildServer({ DATA_DIR: dataDir });
    const tablet = new HttpTablet(server.url, seeded.deviceToken);
    await tablet.signIn(seeded.admin.username);
    const bed = demoBed(seeded.unit.id);
    const stay = demoStay(seeded.unit.id, bed.id);
    expect((await tablet.push([changeOf('bed.put', bed), changeOf('stay.put', stay)])).map((r) => r.status)).toEqual(['accepted', 'accepted']);

    // One uninterrupted push of the same size, to time the kills against.
    const warmUp = Array.from({ length: readsPerBatch }, (_, i) => changeOf('read.sign', demoRead(stay, seeded.admin.id, { stripTimeMs: stay.startMs - (i + 1) * 60_000 })));
    const timedFrom = performance.now();
    expect((await tablet.push(warmUp)).every((r) => r.status === 'accepted')).toBe(true);
    const pushMs = performance.now() - timedFrom;

    const tabletReadIds: string[] = warmUp.map((c) => (c.record as { id: string }).id);
    let unansweredPushes = 0;
    const storedAfterKill: number[] = [];
    for (let round = 0; round < rounds; round += 1) {
      const batch: Change[] = Array.from({ length: readsPerBatch }, (_, i) =>
        changeOf('read.sign', demoRead(stay, seeded.admin.id, { stripTimeMs: stay.startMs + (round * readsPerBatch + i) * 60_000 })),
      );
      tabletReadIds.push(...batch.map((c) => (c.record as { id: string }).id));

      // Send the push, then kill the server while it works on it (a 200-read push takes a few hundred ms here).
      const attempt = tablet.push(batch).then(
        () => 'answered' as const,
        () => 'no answer' as const,
      );
      await new Promise((r) => setTimeout(r, pushMs * (killPoints[round] as number)));
      await server.kill('SIGKILL');
      if ((await attempt) === 'no answer') unansweredPushes += 1;

      server = await startChildServer({ DATA_DIR: dataDir });
      tablet.baseUrl = server.url;
      // The session survives the restart (it lives in the database); the batch is either all there or not at all.
      const batchIds = new Set(batch.map((c) => (c.record as { id: string }).id));
      const storedOfBatch = (await tablet.pullAll()).filter((c) => c.kind === 'read.sign' && batchIds.has(c.record.id)).length;
      expect([0, readsPerBatch]).toContain(storedOfBatch);
      storedAfterKill.push(storedOfBatch);

      // The tablet retries the same outbox batch: every change accepted, each read once.
      const retry = await tablet.push(batch);
      expect(retry.every((r) => r.status === 'accepted')).toBe(true);
      expect(await tablet.push(batch)).toEqual(retry);
    }
    expect(unansweredPushes).toBeGreaterThanOrEqual(1);

    const pulledReads = (await tablet.pullAll()).filter((c) => c.kind === 'read.sign');
    const pulledIds = pulledReads.map((c) => c.record.id);
    const totalReads = (rounds + 1) * readsPerBatch;
    expect(tabletReadIds.length).toBe(totalReads);
    expect(pulledIds.length).toBe(totalReads);
    expect(new Set(pulledIds)).toEqual(new Set(tabletReadIds));
    await server.kill('SIGTERM');

    const after = await openSqliteStore(join(dataDir, sqliteFileName));
    const all = await after.pullChanges(seeded.unit.id, 0, 10_000);
    expect(all.filter((c) => c.kind === 'read.sign').length).toBe(totalReads);
    expect(all.map((c) => c.seq)).toEqual(Array.from({ length: all.length }, (_, i) => i + 1));
    console.log(`kill mid-push (a 200-read push takes ${Math.round(pushMs)} ms): ${unansweredPushes} of ${rounds} pushes killed before answering (batch found whole after restart: ${storedAfterKill.join(', ')}); reads: tablet ${tabletReadIds.length}, pulled ${pulledIds.length}, stored ${all.filter((c) => c.kind === 'read.sign').length}`);
    await after.close();
  }, 120_000);
});
