import { describe, expect, it } from 'vitest';
import { RhythmDb } from '../../src/store/db.ts';
import type { SyncEngine } from '../../src/sync/sync-engine.ts';
import type { FakeUnitServer } from './fake-unit-server.ts';
import { ManualClock, engineFor, hourMs, newServer, newTablet, nurseAsh, nurseBay, readCounts, signInTablet, signReadAt, stay, t0 } from './sync-fixtures.ts';

/** A third tablet that only pulls: what the charge nurse's tablet would see. */
async function observer(server: FakeUnitServer, clock: ManualClock): Promise<RhythmDb> {
  const db = new RhythmDb(`sync-observer-${Math.random().toString(36).slice(2)}`);
  await signInTablet(db, server, nurseBay.id);
  const engine = await engineFor(db, server, clock);
  const result = await engine.syncNow();
  expect(result.ok).toBe(true);
  return db;
}

/** Read-sign changes in the server log, and how many distinct change ids and read ids they hold. */
function serverReadLog(server: FakeUnitServer) {
  const entries = server.log.filter((l) => l.kind === 'read.sign');
  return { entries: entries.length, changeIds: new Set(entries.map((l) => l.changeId)).size, readIds: new Set(entries.map((l) => l.record.id)).size };
}

async function settle(engine: SyncEngine) {
  // Joins the run under way (or starts one) and returns when it is over.
  return engine.syncNow();
}

describe('sync under faults', () => {
  it('a push whose answer is lost and is sent again leaves exactly one read on the server and on the tablet', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    await signReadAt(db, t0);
    server.injectPushFault({ kind: 'lose-answer' });
    const engine = await engineFor(db, server, clock);
    expect((await settle(engine)).ok).toBe(false);
    // The server applied it, but the tablet could not know: the read still waits on the tablet.
    expect(server.reads.size).toBe(1);
    expect(await readCounts(db)).toEqual({ all: 1, accepted: 0, pending: 1, rejected: 0 });
    expect((await settle(engine)).ok).toBe(true);
    expect(server.pushRequests).toBe(2);
    expect(serverReadLog(server)).toEqual({ entries: 1, changeIds: 1, readIds: 1 });
    expect(await readCounts(db)).toEqual({ all: 1, accepted: 1, pending: 0, rejected: 0 });
    expect(await readCounts(await observer(server, clock))).toEqual({ all: 1, accepted: 1, pending: 0, rejected: 0 });
  });

  it('a push delayed on the network and delivered after its resend (reordered) is answered as the first and adds nothing', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    for (let i = 0; i < 3; i += 1) await signReadAt(db, t0 + i * 60_000);
    let deliverLate: (() => Promise<void>) | null = null;
    server.injectPushFault({ kind: 'delay', onHeld: (deliver) => { deliverLate = deliver; } });
    const engine = await engineFor(db, server, clock);
    expect((await settle(engine)).ok).toBe(false);
    expect(server.reads.size).toBe(0);
    // The resend arrives first; then two more reads are signed and sent.
    expect((await settle(engine)).ok).toBe(true);
    await signReadAt(db, t0 + 10 * 60_000);
    await signReadAt(db, t0 + 11 * 60_000);
    expect((await settle(engine)).ok).toBe(true);
    // Only now does the first request reach the server, behind everything sent after it.
    await deliverLate!();
    expect(serverReadLog(server)).toEqual({ entries: 5, changeIds: 5, readIds: 5 });
    expect(server.reads.size).toBe(5);
    expect((await settle(engine)).ok).toBe(true);
    expect(await readCounts(db)).toEqual({ all: 5, accepted: 5, pending: 0, rejected: 0 });
    expect(await readCounts(await observer(server, clock))).toEqual({ all: 5, accepted: 5, pending: 0, rejected: 0 });
  });

  it('a push cut off after 4 of 10 changes were applied is completed by the resend: exactly 10 everywhere', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    for (let i = 0; i < 10; i += 1) await signReadAt(db, t0 + i * 60_000);
    server.injectPushFault({ kind: 'partial', applied: 4 });
    const engine = await engineFor(db, server, clock);
    expect((await settle(engine)).ok).toBe(false);
    expect(server.reads.size).toBe(4);
    expect(await readCounts(db)).toMatchObject({ all: 10, pending: 10 });
    expect((await settle(engine)).ok).toBe(true);
    expect(serverReadLog(server)).toEqual({ entries: 10, changeIds: 10, readIds: 10 });
    expect(await readCounts(db)).toEqual({ all: 10, accepted: 10, pending: 0, rejected: 0 });
    expect(await readCounts(await observer(server, clock))).toEqual({ all: 10, accepted: 10, pending: 0, rejected: 0 });
  });

  it('a tablet offline for a whole 12 h shift with 100 reads ends with exactly 100 on the server and on every tablet', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    let online = false;
    const events = new EventTarget();
    const engine = await engineFor(db, server, clock, { isOnline: () => online, events, random: () => 0.5 });
    engine.start();
    const shiftEndMs = t0 + 12 * hourMs;
    // 100 reads spread across the shift (every 7 min 12 s); the engine keeps retrying in between.
    const readEveryMs = (12 * hourMs) / 100;
    for (let i = 0; i < 100; i += 1) {
      const dueMs = t0 + Math.round(i * readEveryMs);
      for (let next = clock.nextTimerAtMs(); next !== null && next <= dueMs; next = clock.nextTimerAtMs()) {
        clock.advance(next - clock.nowMs);
        await settle(engine);
      }
      clock.nowMs = Math.max(clock.nowMs, dueMs);
      await signReadAt(db, clock.nowMs);
    }
    await settle(engine);
    expect(clock.nowMs).toBeLessThan(shiftEndMs);
    expect(server.reads.size).toBe(0);
    expect(await readCounts(db)).toEqual({ all: 100, accepted: 0, pending: 100, rejected: 0 });
    expect(engine.getState()).toMatchObject({ pendingCount: 100, lastErrorKind: 'unreachable' });
    // Retries backed off to the 5-minute cap rather than hammering: at 0.5 of the ceiling, 150 s.
    expect(Math.max(...clock.delaysMs.filter((d) => d !== 30_000))).toBe(150_000);

    clock.nowMs = shiftEndMs;
    online = true;
    events.dispatchEvent(new Event('online'));
    expect((await settle(engine)).ok).toBe(true);
    expect(server.reads.size).toBe(100);
    expect(serverReadLog(server)).toEqual({ entries: 100, changeIds: 100, readIds: 100 });
    expect(await readCounts(db)).toEqual({ all: 100, accepted: 100, pending: 0, rejected: 0 });
    expect(await readCounts(await observer(server, clock))).toEqual({ all: 100, accepted: 100, pending: 0, rejected: 0 });
    engine.stop();
  }, 30_000);

  it('two tablets reading one bed keep both tablets\u2019 reads: 3 + 2 = 5 on each tablet and on the server', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const tabletA = await newTablet();
    const tabletB = await newTablet();
    await signInTablet(tabletA, server, nurseAsh.id);
    await signInTablet(tabletB, server, nurseBay.id);
    // Both offline, both chart on the same patient's bed.
    for (let i = 0; i < 3; i += 1) await signReadAt(tabletA, t0 + i * hourMs, { deviceId: 'tablet-a' });
    for (let i = 0; i < 2; i += 1) await signReadAt(tabletB, t0 + i * hourMs + 30_000, { deviceId: 'tablet-b', author: { id: nurseBay.id, name: nurseBay.name } });
    const engineA = await engineFor(tabletA, server, clock);
    const engineB = await engineFor(tabletB, server, clock);
    expect((await settle(engineA)).ok).toBe(true);
    expect((await settle(engineB)).ok).toBe(true);
    expect((await settle(engineA)).ok).toBe(true);
    expect(server.readsOfStay(stay.id)).toHaveLength(5);
    expect(await readCounts(tabletA)).toEqual({ all: 5, accepted: 5, pending: 0, rejected: 0 });
    expect(await readCounts(tabletB)).toEqual({ all: 5, accepted: 5, pending: 0, rejected: 0 });
    expect((await tabletA.reads.where('stayId').equals(stay.id).toArray()).map((r) => r.deviceId).sort()).toEqual(['tablet-a', 'tablet-a', 'tablet-a', 'tablet-b', 'tablet-b']);
  });

  it('a tablet clock 6 h behind keeps server order, keeps its device times as data, and loses nothing', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const slowClock = new ManualClock(t0 - 6 * hourMs);
    const onTime = await newTablet();
    const slow = await newTablet();
    await signInTablet(onTime, server, nurseAsh.id);
    await signInTablet(slow, server, nurseBay.id);
    const engineOnTime = await engineFor(onTime, server, clock);
    const engineSlow = await engineFor(slow, server, slowClock);
    // Interleaved in real time: on-time, slow, on-time, slow (the slow tablet's times say 6 h earlier).
    const first = await signReadAt(onTime, clock.nowMs);
    await settle(engineOnTime);
    clock.advance(10 * 60_000);
    slowClock.advance(10 * 60_000);
    const second = await signReadAt(slow, slowClock.nowMs, { deviceId: 'tablet-slow', author: { id: nurseBay.id, name: nurseBay.name } });
    await settle(engineSlow);
    clock.advance(10 * 60_000);
    slowClock.advance(10 * 60_000);
    const third = await signReadAt(onTime, clock.nowMs);
    await settle(engineOnTime);
    clock.advance(10 * 60_000);
    slowClock.advance(10 * 60_000);
    const fourth = await signReadAt(slow, slowClock.nowMs, { deviceId: 'tablet-slow', author: { id: nurseBay.id, name: nurseBay.name } });
    await settle(engineSlow);
    await settle(engineOnTime);

    const readEntries = server.log.filter((l) => l.kind === 'read.sign');
    // Server order is the order of arrival, although the slow tablet's ids and times sort 6 h earlier.
    expect(readEntries.map((l) => l.record.id)).toEqual([first.id, second.id, third.id, fourth.id]);
    expect([...readEntries.map((l) => l.record.id)].sort()).not.toEqual(readEntries.map((l) => l.record.id));
    // The device times travel as data, untouched.
    expect(readEntries.map((l) => l.deviceTimeMs)).toEqual([t0, t0 - 6 * hourMs + 10 * 60_000, t0 + 20 * 60_000, t0 - 6 * hourMs + 30 * 60_000]);
    expect(server.reads.get(second.id)?.signedAtMs).toBe(t0 - 6 * hourMs + 10 * 60_000);
    for (const db of [onTime, slow, await observer(server, clock)]) {
      expect(await readCounts(db)).toEqual({ all: 4, accepted: 4, pending: 0, rejected: 0 });
    }
    expect(server.reads.size).toBe(4);
  });

  it('a tablet clock 14 h ahead, past its session\u2019s expiry time, still sends: only the server decides that a session ended', async () => {
    const server = await newServer();
    const fastClock = new ManualClock(t0 + 14 * hourMs);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    await signReadAt(db, fastClock.nowMs);
    const engine = await engineFor(db, server, fastClock);
    expect((await settle(engine)).ok).toBe(true);
    expect(server.reads.size).toBe(1);
    expect(await readCounts(db)).toEqual({ all: 1, accepted: 1, pending: 0, rejected: 0 });
  });
});
