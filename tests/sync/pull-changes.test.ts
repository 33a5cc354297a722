import { describe, expect, it } from 'vitest';
import { nextCursor, pullChanges, storedCursor } from '../../src/sync/pull-changes.ts';
import { pushOutbox } from '../../src/sync/push-outbox.ts';
import { credentialsOf } from '../../src/sync/server-session.ts';
import { RhythmDb } from '../../src/store/db.ts';
import { ManualClock, bulkSignReads, connectionTo, newServer, newTablet, nurseAsh, nurseBay, readCounts, signInTablet, signReadAt, t0, unit } from './sync-fixtures.ts';

async function emptyTablet(): Promise<RhythmDb> {
  return new RhythmDb(`sync-pull-${Math.random().toString(36).slice(2)}`);
}

/** A server that already holds `howMany` reads pushed by another tablet. */
async function serverWithReads(howMany: number) {
  const server = await newServer();
  const clock = new ManualClock(t0);
  const other = await newTablet();
  await signInTablet(other, server, nurseBay.id);
  await bulkSignReads(other, howMany, t0, 'tablet-other');
  await pushOutbox(other, connectionTo(server, clock), (await credentialsOf(other))!);
  return { server, clock };
}

describe('pullChanges', () => {
  it('pages through 250 reads 100 at a time and ends with all 250, accepted, with the server figures, and the cursor at the last seq', async () => {
    const { server, clock } = await serverWithReads(250);
    const db = await emptyTablet();
    await signInTablet(db, server, nurseAsh.id);
    const summary = await pullChanges(db, connectionTo(server, clock), (await credentialsOf(db))!, unit.id, 100);
    expect(summary).toMatchObject({ pages: 3, received: 253, readsAdded: 250, cursor: 253 });
    expect(await readCounts(db)).toEqual({ all: 250, accepted: 250, pending: 0, rejected: 0 });
    // The unit, bed and stay came first in server order, so the stay was known for every read.
    expect(await db.stays.count()).toBe(1);
    // 20 small boxes at 25 mm/s = 75 bpm (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology, 1500 rule).
    expect((await db.reads.toArray()).every((r) => r.analysis?.rate.rateBpm === 75)).toBe(true);
    expect(await storedCursor(db, unit.id)).toBe(253);
  });

  it('keeps the cursor where the records end when the connection drops mid-pull, then resumes without a gap or a duplicate', async () => {
    const { server, clock } = await serverWithReads(250);
    const db = await emptyTablet();
    await signInTablet(db, server, nurseAsh.id);
    const connection = connectionTo(server, clock);
    let calls = 0;
    const flaky = { ...connection, fetch: async (url: string, init: Parameters<typeof connection.fetch>[1]) => {
      calls += 1;
      if (calls === 2) throw new TypeError('Failed to fetch');
      return connection.fetch(url, init);
    } };
    await expect(pullChanges(db, flaky, (await credentialsOf(db))!, unit.id, 100)).rejects.toMatchObject({ kind: 'unreachable' });
    expect(await storedCursor(db, unit.id)).toBe(100);
    expect((await readCounts(db)).all).toBe(97);
    await pullChanges(db, connection, (await credentialsOf(db))!, unit.id, 100);
    expect((await readCounts(db)).all).toBe(250);
    expect(new Set((await db.reads.toArray()).map((r) => r.id)).size).toBe(250);
    expect(await storedCursor(db, unit.id)).toBe(253);
  });

  it('never skips a change committed late: seq 5 handed out before seq 4 commits, and the tablet still ends with both', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const tabletA = await newTablet();
    const tabletB = await newTablet();
    const reader = await emptyTablet();
    for (const [db, user] of [[tabletA, nurseAsh.id], [tabletB, nurseBay.id], [reader, nurseAsh.id]] as const) await signInTablet(db, server, user);
    const readA = await signReadAt(tabletA, t0, { deviceId: 'tablet-a' });
    const readB = await signReadAt(tabletB, t0 + 60_000, { deviceId: 'tablet-b' });

    // Tablet A's change gets seq 4, but its transaction has not committed yet.
    server.holdCommitWhen = (change) => change.kind === 'read.sign' && change.record.id === readA.id;
    const pushA = pushOutbox(tabletA, connectionTo(server, clock), (await credentialsOf(tabletA))!);
    await new Promise((resolve) => setTimeout(resolve, 20));
    server.holdCommitWhen = null;
    await pushOutbox(tabletB, connectionTo(server, clock), (await credentialsOf(tabletB))!);
    expect(server.log.map((l) => [l.seq, l.committed])).toEqual([[1, true], [2, true], [3, true], [4, false], [5, true]]);

    const readerCredentials = (await credentialsOf(reader))!;
    await pullChanges(reader, connectionTo(server, clock), readerCredentials, unit.id);
    expect(await storedCursor(reader, unit.id)).toBe(3);
    expect(await reader.reads.count()).toBe(0);

    server.releaseCommits();
    await pushA;
    await pullChanges(reader, connectionTo(server, clock), readerCredentials, unit.id);
    expect((await reader.reads.toArray()).map((r) => r.id).sort()).toEqual([readA.id, readB.id].sort());
    expect(await storedCursor(reader, unit.id)).toBe(5);
    expect(server.reads.size).toBe(2);
  });

  it('confirms a read the tablet already holds instead of adding it twice, taking the server figures', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    await signInTablet(db, server, nurseAsh.id);
    const read = await signReadAt(db, t0);
    // The push reaches the server but its answer is lost: the tablet still thinks the read waits.
    server.injectPushFault({ kind: 'lose-answer' });
    await expect(pushOutbox(db, connectionTo(server, clock), (await credentialsOf(db))!)).rejects.toMatchObject({ kind: 'unreachable' });
    await db.reads.update(read.id, { analysis: null });
    const summary = await pullChanges(db, connectionTo(server, clock), (await credentialsOf(db))!, unit.id);
    expect(summary).toMatchObject({ readsAdded: 0, readsConfirmed: 1 });
    expect(await readCounts(db)).toEqual({ all: 1, accepted: 1, pending: 0, rejected: 0 });
    const stored = await db.reads.get(read.id);
    expect(stored?.analysis?.coreVersion).toBe(server.log.at(-1)?.derived?.coreVersion);
    expect(stored?.analysis?.rate.rateBpm).toBe(75);
  });

  it('applies nothing from a page whose read breaks the shared schema, and keeps the cursor', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await emptyTablet();
    await signInTablet(db, server, nurseAsh.id);
    const connection = connectionTo(server, clock);
    const bad = { ...connection, fetch: async () => ({ status: 200, json: async () => ({
      changes: [
        { seq: 1, kind: 'unit.put', record: unit, serverTimeMs: t0 },
        { seq: 2, kind: 'read.sign', record: { id: 'read-without-counts', unitId: unit.id }, serverTimeMs: t0 },
      ],
      cursor: 2,
      hasMore: false,
    }) }) };
    await expect(pullChanges(db, bad, (await credentialsOf(db))!, unit.id)).rejects.toThrow(/did not match the sync contract/);
    expect(await db.units.count()).toBe(0);
    expect(await storedCursor(db, unit.id)).toBe(0);
  });

  it('stops rather than looping when the server says more waits but sends nothing new', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await emptyTablet();
    await signInTablet(db, server, nurseAsh.id);
    let calls = 0;
    const stuck = { ...connectionTo(server, clock), fetch: async () => {
      calls += 1;
      return { status: 200, json: async () => ({ changes: [], cursor: 0, hasMore: true }) };
    } };
    await expect(pullChanges(db, stuck, (await credentialsOf(db))!, unit.id)).rejects.toMatchObject({ kind: 'malformed' });
    expect(calls).toBe(1);
  });

  it('starts from the beginning for a unit other than the one the stored cursor belongs to', async () => {
    const { server, clock } = await serverWithReads(3);
    const db = await emptyTablet();
    await signInTablet(db, server, nurseAsh.id);
    await pullChanges(db, connectionTo(server, clock), (await credentialsOf(db))!, unit.id);
    expect(await storedCursor(db, unit.id)).toBe(6);
    expect(await storedCursor(db, 'unit-another-0001')).toBe(0);
  });
});

describe('nextCursor', () => {
  const change = (seq: number) => ({ seq, kind: 'bed.put' as const, serverTimeMs: t0, record: { id: `bed-${seq}-0000`, unitId: unit.id, label: 'B', sortOrder: 0, active: true } });

  it('moves to the last seq received', () => {
    expect(nextCursor(3, { changes: [change(4), change(5)], cursor: 5 })).toBe(5);
  });

  it('never moves past what was received, even when the server cursor runs ahead', () => {
    expect(nextCursor(3, { changes: [change(4), change(5)], cursor: 9 })).toBe(5);
  });

  it('does not move on an empty page', () => {
    expect(nextCursor(7, { changes: [], cursor: 12 })).toBe(7);
  });

  it('never moves backwards', () => {
    expect(nextCursor(7, { changes: [change(8)], cursor: 2 })).toBe(7);
  });

  it('takes a text cursor as the server gives it once a page held changes', () => {
    expect(nextCursor(0, { changes: [change(1)], cursor: 'opaque-1' })).toBe('opaque-1');
  });
});

describe('adoptUnit', () => {
  it('makes the pulled unit the tablet unit on a new tablet, and leaves a tablet that has one alone', async () => {
    const { adoptUnit } = await import('../../src/sync/adopt-unit.ts');
    const { readSetting, writeSetting } = await import('../../src/store/settings.ts');
    const fresh = await emptyTablet();
    expect(await adoptUnit(fresh, unit.id)).toBe(false);
    await fresh.units.put(unit);
    expect(await adoptUnit(fresh, unit.id)).toBe(true);
    expect(await readSetting(fresh, 'currentUnitId', null)).toBe(unit.id);
    const demo = await newTablet();
    await writeSetting(demo, 'currentUnitId', 'demo-unit-7-north');
    expect(await adoptUnit(demo, unit.id)).toBe(false);
    expect(await readSetting(demo, 'currentUnitId', null)).toBe('demo-unit-7-north');
  });
});
