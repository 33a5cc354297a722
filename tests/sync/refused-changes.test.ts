import { describe, expect, it } from 'vitest';
import { countRefused, listRefusedChanges, markRefusedSeen, refusedCounts } from '../../src/sync/refused-changes.ts';
import { ManualClock, bed, engineFor, newServer, newTablet, nurseAsh, signInTablet, signReadAt, stay, t0 } from './sync-fixtures.ts';

/** A tablet whose first read the fake server refuses for good, and whose second it accepts. */
async function tabletWithOneRefusedRead() {
  const server = await newServer();
  const clock = new ManualClock(t0);
  const db = await newTablet();
  await signInTablet(db, server, nurseAsh.id);
  const refused = await signReadAt(db, t0, { notes: 'refuse' });
  const accepted = await signReadAt(db, t0 + 60_000);
  server.rejectWhen = (change) => (change.kind === 'read.sign' && change.record.notes === 'refuse' ? 'The clinician named on this change is not an active account on this unit.' : null);
  const engine = await engineFor(db, server, clock);
  await engine.syncNow();
  return { db, engine, refused, accepted };
}

describe('refused changes', () => {
  it('lists a refused read with the server\'s reason, its bed, patient alias, strip time and author, and leaves accepted reads out', async () => {
    const { db, refused } = await tabletWithOneRefusedRead();
    const listed = await listRefusedChanges(db);
    expect(listed).toHaveLength(1);
    expect(listed[0]).toMatchObject({
      kind: 'read.sign',
      recordId: refused.id,
      reason: 'The clinician named on this change is not an active account on this unit.',
      bedId: bed.id,
      bedLabel: 'Bed 1',
      alias: stay.alias,
      readId: refused.id,
      stripTimeMs: t0 - 60_000,
      authorName: nurseAsh.name,
      seen: null,
    });
  });

  it('marks a refused change as seen: it stays listed (under seen) and on the tablet, and the sync line stops counting it', async () => {
    const { db, engine, refused } = await tabletWithOneRefusedRead();
    expect(engine.getState()).toMatchObject({ rejectedCount: 1, rejectedReadCount: 1, seenRejectedCount: 0 });
    const [change] = await listRefusedChanges(db);
    await markRefusedSeen(db, change!.changeId, { id: nurseAsh.id, name: nurseAsh.name }, t0 + 3_600_000);
    expect(await refusedCounts(db)).toEqual({ unseen: 0, unseenReads: 0, seen: 1 });
    await engine.refresh();
    expect(engine.getState()).toMatchObject({ rejectedCount: 0, rejectedReadCount: 0, seenRejectedCount: 1 });
    expect((await listRefusedChanges(db))[0]?.seen).toEqual({ seenAtMs: t0 + 3_600_000, seenById: nurseAsh.id, seenByName: nurseAsh.name });
    expect(await db.reads.get(refused.id)).toMatchObject({ syncStatus: 'rejected', rejectReason: 'The clinician named on this change is not an active account on this unit.' });
    expect(await db.outbox.where('status').equals('rejected').count()).toBe(1);
  });

  it('keeps the first seen mark, and ignores a mark for a change that was not refused', async () => {
    const { db, accepted } = await tabletWithOneRefusedRead();
    const [change] = await listRefusedChanges(db);
    await markRefusedSeen(db, change!.changeId, { id: nurseAsh.id, name: nurseAsh.name }, t0 + 1_000);
    await markRefusedSeen(db, change!.changeId, { id: 'user-other', name: 'Someone Else' }, t0 + 2_000);
    expect((await listRefusedChanges(db))[0]?.seen?.seenByName).toBe(nurseAsh.name);
    const acceptedRow = await db.outbox.filter((r) => r.change.record.id === accepted.id).first();
    await markRefusedSeen(db, acceptedRow!.changeId, { id: nurseAsh.id, name: nurseAsh.name }, t0 + 3_000);
    expect(await refusedCounts(db)).toEqual({ unseen: 0, unseenReads: 0, seen: 1 });
  });

  it('counts reads apart from other refused changes', () => {
    const rows = [
      { changeId: 'a', kind: 'read.sign' as const },
      { changeId: 'b', kind: 'handover.put' as const },
      { changeId: 'c', kind: 'read.sign' as const },
    ];
    expect(countRefused(rows, { c: { seenAtMs: t0, seenById: 'u', seenByName: 'U' } })).toEqual({ unseen: 2, unseenReads: 1, seen: 1 });
  });
});
