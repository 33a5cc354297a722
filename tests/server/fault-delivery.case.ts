import { afterEach, beforeEach, expect, it } from 'vitest';
import type { Change, Stay } from '../../src/core/records.ts';
import { baseTimeMs, changeOf, demoBed, demoRead, demoStay } from './fixtures.ts';
import { pullAll, push } from './sync-helpers.ts';
import type { Clinician, TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';
import type { TestStore } from './test-databases.ts';

const hourMs = 3_600_000;

/** Delivery faults a ward network produces, each ending with an exact count of reads on every side. */
export function runDeliveryFaults({ newStore }: { newStore: () => Promise<TestStore> }): void {
  let testStore: TestStore;
  let t: TestApp;
  let tabletA: Clinician;
  let tabletB: Clinician;
  let charge: Clinician;
  let stays: Stay[];

  beforeEach(async () => {
    testStore = await newStore();
    t = await openTestApp({ store: testStore.store });
    const deviceB = await t.enrollDevice('Tablet B');
    tabletA = await t.clinician('nurse');
    tabletB = await t.clinician('nurse', { deviceToken: deviceB });
    charge = await t.clinician('charge-nurse');
    const beds = Array.from({ length: 8 }, (_, i) => demoBed(t.unit.id, `Bed ${i + 1}`, { sortOrder: i }));
    stays = beds.map((bed, i) => demoStay(t.unit.id, bed.id, { alias: `P${i}` }));
    await push(t.admin, [...beds.map((b) => changeOf('bed.put', b)), ...stays.map((s) => changeOf('stay.put', s))]);
  });
  afterEach(async () => {
    await t.app.close();
    await testStore.dispose();
  });

  const readsBy = (who: Clinician, count: number, startMs: number, clockOffsetMs = 0): Change[] =>
    Array.from({ length: count }, (_, i) => {
      const stay = stays[i % stays.length] as Stay;
      const stripTimeMs = startMs + i * 7 * 60_000;
      return changeOf(
        'read.sign',
        demoRead(stay, who.user.id, { stripTimeMs: stripTimeMs + clockOffsetMs, enteredAtMs: stripTimeMs + clockOffsetMs + 60_000, signedAtMs: stripTimeMs + clockOffsetMs + 90_000 }),
        stripTimeMs + clockOffsetMs + 90_000,
      );
    });
  const readIdsOf = (changes: Change[]) => changes.map((c) => (c.record as { id: string }).id);
  const pulledReadIds = async (who: Clinician) => (await pullAll(who)).changes.filter((c) => c.kind === 'read.sign').map((c) => c.record.id);
  const storedReadCount = async () => (await testStore.store.pullChanges(t.unit.id, 0, 100_000)).filter((c) => c.kind === 'read.sign').length;

  it('duplicated pushes (the same batch sent twice at once, then again) store each read once', async () => {
    const batch = readsBy(tabletA, 50, baseTimeMs);
    const [first, second] = await Promise.all([push(tabletA, batch), push(tabletA, batch)]);
    const third = await push(tabletA, batch);
    expect(second).toEqual(first);
    expect(third).toEqual(first);
    expect(new Set(first?.map((r) => r.seq)).size).toBe(50);
    const pulled = await pulledReadIds(charge);
    expect([batch.length, pulled.length, await storedReadCount()]).toEqual([50, 50, 50]);
  });

  it('reordered pushes (reads before their stay, later batch first) lose nothing once retried', async () => {
    const newBed = demoBed(t.unit.id, 'Bed 9');
    const newStay = demoStay(t.unit.id, newBed.id, { alias: 'NEW' });
    const admit = [changeOf('bed.put', newBed), changeOf('stay.put', newStay)];
    const reads = Array.from({ length: 20 }, (_, i) => changeOf('read.sign', demoRead(newStay, charge.user.id, { stripTimeMs: baseTimeMs + i * 600_000 })));
    const early = await push(charge, reads);
    expect(early.every((r) => r.status === 'rejected' && r.retryable === true)).toBe(true);
    expect((await push(charge, admit)).map((r) => r.status)).toEqual(['accepted', 'accepted']);
    const retried = await push(charge, [...reads].reverse());
    expect(retried.every((r) => r.status === 'accepted')).toBe(true);
    const pulled = await pulledReadIds(tabletA);
    expect([reads.length, pulled.length, await storedReadCount()]).toEqual([20, 20, 20]);
  });

  it('a partially delivered push (applied, answer lost) retried whole gives the first answers for the delivered part', async () => {
    const batch = readsBy(tabletA, 60, baseTimeMs);
    const delivered = await push(tabletA, batch.slice(0, 35));
    const whole = await push(tabletA, batch);
    expect(whole.slice(0, 35)).toEqual(delivered);
    expect(whole.every((r) => r.status === 'accepted')).toBe(true);
    expect([batch.length, (await pulledReadIds(tabletB)).length, await storedReadCount()]).toEqual([60, 60, 60]);
  });

  it('a tablet offline for a whole shift with 100 reads syncs them all while another tablet kept working', async () => {
    const offline = readsBy(tabletA, 100, baseTimeMs);
    const online = readsBy(tabletB, 30, baseTimeMs + 5 * 60_000);
    for (let i = 0; i < online.length; i += 10) await push(tabletB, online.slice(i, i + 10));
    // Back online at the end of the 12 h shift: the outbox goes up in batches, one batch lost on the way and resent.
    const batches = [offline.slice(0, 40), offline.slice(40, 80), offline.slice(80)];
    await push(tabletA, batches[0] as Change[]);
    await push(tabletA, batches[1] as Change[]);
    await push(tabletA, batches[1] as Change[]);
    await push(tabletA, batches[2] as Change[]);
    const pulledByCharge = await pulledReadIds(charge);
    const pulledByA = await pulledReadIds(tabletA);
    expect(new Set(pulledByCharge)).toEqual(new Set([...readIdsOf(offline), ...readIdsOf(online)]));
    expect([offline.length + online.length, pulledByCharge.length, pulledByA.length, await storedReadCount()]).toEqual([130, 130, 130, 130]);
  });

  it('a tablet clock 6 h fast neither reorders nor loses anything: server order rules, device time is kept as data', async () => {
    const sixHoursMs = 6 * hourMs;
    t.clock.nowMs = baseTimeMs + hourMs;
    const fast = readsBy(tabletB, 12, baseTimeMs, sixHoursMs);
    const right = readsBy(tabletA, 12, baseTimeMs);
    const stay = stays[0] as Stay;
    await push(tabletB, [...fast, changeOf('stay.put', { ...stay, notes: 'from the fast tablet', updatedAtMs: baseTimeMs + sixHoursMs }, baseTimeMs + sixHoursMs)]);
    t.clock.nowMs += 60_000;
    await push(tabletA, [...right, changeOf('stay.put', { ...stay, notes: 'from the right tablet', updatedAtMs: baseTimeMs }, baseTimeMs)]);

    const pulled = (await pullAll(charge)).changes;
    const seqs = pulled.map((c) => c.seq);
    expect(seqs).toEqual([...seqs].sort((a, b) => a - b));
    const fromFast = pulled.filter((c) => c.kind === 'read.sign' && c.record.authorId === tabletB.user.id);
    expect(fromFast.every((c) => c.deviceTimeMs - c.serverTimeMs > 4 * hourMs)).toBe(true);
    expect(fromFast[0]?.record.stripTimeMs).toBe(baseTimeMs + sixHoursMs);
    // The later edit in server order wins, though its device time is six hours earlier.
    expect((await testStore.store.inUnitTransaction(t.unit.id, (tx) => tx.getStay(stay.id)))?.notes).toBe('from the right tablet');
    expect(pulled.filter((c) => c.kind === 'stay.put' && c.record.id === stay.id).map((c) => c.record.notes)).toEqual(['', 'from the fast tablet', 'from the right tablet']);
    expect([fast.length + right.length, pulled.filter((c) => c.kind === 'read.sign').length, await storedReadCount()]).toEqual([24, 24, 24]);
  });
}
