import { describe, expect, it } from 'vitest';
import { saveBed } from '../../src/store/unit-setup.ts';
import { waitsForRole } from '../../src/sync/change-needs-role.ts';
import { pushOutbox, rejectReasonOf } from '../../src/sync/push-outbox.ts';
import type { CallCredentials } from '../../src/sync/server-call.ts';
import { SyncError } from '../../src/sync/sync-error.ts';
import { ManualClock, adminCy, bed, bulkSignReads, connectionTo, newServer, newTablet, nurseAsh, readCounts, signReadAt, t0 } from './sync-fixtures.ts';

async function setUp() {
  const server = await newServer();
  const db = await newTablet();
  const clock = new ManualClock(t0);
  const credentials: CallCredentials = { sessionToken: server.sessionFor(nurseAsh.id), deviceToken: 'device-token-1' };
  return { server, db, clock, connection: connectionTo(server, clock), credentials };
}

describe('pushOutbox', () => {
  it('sends 450 waiting reads in order in batches of 200, 200 and 50, and marks every one accepted', async () => {
    const { server, db, connection, credentials } = await setUp();
    await bulkSignReads(db, 450, t0);
    const summary = await pushOutbox(db, connection, credentials);
    expect(summary).toEqual({ batches: 3, accepted: 450, rejected: 0, deferred: 0, deferredReason: null });
    expect(server.batchSizes).toEqual([200, 200, 50]);
    expect(server.reads.size).toBe(450);
    expect(await readCounts(db)).toEqual({ all: 450, accepted: 450, pending: 0, rejected: 0 });
    // Server order follows the outbox order: the read signed first got the first seq after set-up.
    const outbox = await db.outbox.orderBy('seq').toArray();
    const serverOrder = server.log.filter((l) => l.kind === 'read.sign').map((l) => l.changeId);
    expect(serverOrder).toEqual(outbox.map((r) => r.changeId));
  });

  it('honours a smaller batch size', async () => {
    const { server, db, connection, credentials } = await setUp();
    for (let i = 0; i < 5; i += 1) await signReadAt(db, t0 + i * 60_000);
    await pushOutbox(db, connection, credentials, 2);
    expect(server.batchSizes).toEqual([2, 2, 1]);
  });

  it('answers per change: one refused read keeps its reason beside it while the others are accepted', async () => {
    const { server, db, connection, credentials } = await setUp();
    const first = await signReadAt(db, t0);
    const refused = await signReadAt(db, t0 + 60_000, { notes: 'refuse me' });
    const third = await signReadAt(db, t0 + 120_000);
    server.rejectWhen = (change) => (change.kind === 'read.sign' && change.record.notes === 'refuse me' ? 'This monitoring ended before the strip time; check the bed.' : null);
    const summary = await pushOutbox(db, connection, credentials);
    expect(summary).toEqual({ batches: 1, accepted: 2, rejected: 1, deferred: 0, deferredReason: null });
    expect((await db.reads.get(first.id))?.syncStatus).toBe('accepted');
    expect((await db.reads.get(third.id))?.syncStatus).toBe('accepted');
    const stored = await db.reads.get(refused.id);
    expect(stored).toMatchObject({ syncStatus: 'rejected', rejectReason: 'This monitoring ended before the strip time; check the bed.' });
    // The refused change is never deleted: its outbox row stays, with the reason, and is not sent again.
    const row = (await db.outbox.toArray()).find((r) => r.change.record.id === refused.id);
    expect(row).toMatchObject({ status: 'rejected', rejectReason: 'This monitoring ended before the strip time; check the bed.', attempts: 1 });
    await pushOutbox(db, connection, credentials);
    expect(server.pushRequests).toBe(1);
    expect(await readCounts(db)).toEqual({ all: 3, accepted: 2, pending: 0, rejected: 1 });
    expect(server.reads.size).toBe(2);
  });

  it('keeps a change refused only for now waiting, with the reason beside it, and sends it again later', async () => {
    const { server, db, connection, credentials } = await setUp();
    const read = await signReadAt(db, t0);
    const reason = 'This was entered by Bay Invented, who has not signed in online on this tablet; it will be sent when they sign in here.';
    server.rejectWhen = () => ({ reason, retryable: true });
    expect(await pushOutbox(db, connection, credentials)).toEqual({ batches: 1, accepted: 0, rejected: 0, deferred: 1, deferredReason: reason });
    expect(await db.reads.get(read.id)).toMatchObject({ syncStatus: 'pending', rejectReason: reason });
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'pending', attempts: 1, rejectReason: reason });
    server.rejectWhen = null;
    expect(await pushOutbox(db, connection, credentials)).toMatchObject({ accepted: 1, deferred: 0 });
    const stored = await db.reads.get(read.id);
    expect(stored?.syncStatus).toBe('accepted');
    expect(stored?.rejectReason).toBeUndefined();
    expect(server.reads.size).toBe(1);
  });

  it('leaves every row waiting with one more attempt when the server answers 503', async () => {
    const { server, db, connection, credentials } = await setUp();
    await signReadAt(db, t0);
    await signReadAt(db, t0 + 60_000);
    server.injectPushFault({ kind: 'status', status: 503 });
    const attempt = pushOutbox(db, connection, credentials);
    await expect(attempt).rejects.toMatchObject({ kind: 'server', status: 503 });
    const rows = await db.outbox.toArray();
    expect(rows.map((r) => [r.status, r.attempts])).toEqual([['pending', 1], ['pending', 1]]);
    expect(await readCounts(db)).toEqual({ all: 2, accepted: 0, pending: 2, rejected: 0 });
  });

  it('leaves rows waiting when the network is down, and sends them all once it is back', async () => {
    const { server, db, connection, credentials } = await setUp();
    await signReadAt(db, t0);
    const offline = { ...connection, fetch: async () => { throw new TypeError('Failed to fetch'); } };
    await expect(pushOutbox(db, offline, credentials)).rejects.toMatchObject({ kind: 'unreachable' });
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'pending', attempts: 1 });
    await pushOutbox(db, connection, credentials);
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'accepted', attempts: 2 });
    expect(server.reads.size).toBe(1);
  });

  it('stops on an ended session (401) and keeps every row waiting without counting an attempt', async () => {
    const { server, db, connection, credentials } = await setUp();
    await signReadAt(db, t0);
    server.expireSessions();
    const attempt = pushOutbox(db, connection, credentials);
    await expect(attempt).rejects.toBeInstanceOf(SyncError);
    await expect(attempt).rejects.toMatchObject({ kind: 'signed-out', status: 401 });
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'pending', attempts: 0 });
    expect(server.reads.size).toBe(0);
  });

  it('applies nothing from an answer with fewer results than changes sent', async () => {
    const { db, clock, credentials } = await setUp();
    await signReadAt(db, t0);
    await signReadAt(db, t0 + 60_000);
    const short = connectionTo(await newServer(), clock);
    short.fetch = async () => ({ status: 200, json: async () => ({ results: [{ changeId: null, status: 'accepted', seq: 9 }] }) });
    await expect(pushOutbox(db, short, credentials)).rejects.toMatchObject({ kind: 'malformed' });
    expect((await db.outbox.toArray()).map((r) => r.status)).toEqual(['pending', 'pending']);
    expect(await readCounts(db)).toMatchObject({ accepted: 0, pending: 2 });
  });

  it('applies nothing from an answer that names another change in a place', async () => {
    const { db, clock, credentials } = await setUp();
    await signReadAt(db, t0);
    const wrong = connectionTo(await newServer(), clock);
    wrong.fetch = async () => ({ status: 200, json: async () => ({ results: [{ changeId: 'someone-elses-change', status: 'accepted', seq: 9 }] }) });
    await expect(pushOutbox(db, wrong, credentials)).rejects.toMatchObject({ kind: 'malformed' });
    expect((await db.outbox.toArray())[0]?.status).toBe('pending');
  });

  it('applies nothing from an answer that breaks the contract (status "ok")', async () => {
    const { db, clock, credentials } = await setUp();
    await signReadAt(db, t0);
    const odd = connectionTo(await newServer(), clock);
    odd.fetch = async () => ({ status: 200, json: async () => ({ results: [{ changeId: null, status: 'ok' }] }) });
    await expect(pushOutbox(db, odd, credentials)).rejects.toThrow(/did not match the sync contract/);
    expect((await db.outbox.toArray())[0]?.status).toBe('pending');
  });

  it('counts a push that takes longer than the time allowed as a time-out, leaving the row waiting', async () => {
    const { db, clock, connection, credentials } = await setUp();
    await signReadAt(db, t0);
    const hanging = {
      ...connection,
      fetch: (_url: string, init: { signal?: AbortSignal }) =>
        new Promise<never>((_resolve, reject) => init.signal?.addEventListener('abort', () => reject(new DOMException('aborted', 'AbortError')))),
    };
    const attempt = pushOutbox(db, hanging, credentials);
    await new Promise((resolve) => setTimeout(resolve, 10));
    clock.advance(30_000);
    await expect(attempt).rejects.toMatchObject({ kind: 'timeout' });
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'pending', attempts: 1 });
  });

  it('holds back a bed change under a nurse\'s session with the reason, sends the reads behind it, and sends the bed once a unit admin pushes', async () => {
    const { server, db, connection, credentials } = await setUp();
    const renamed = { ...bed, label: 'Bed 1 (window)' };
    await saveBed(db, renamed, t0);
    await signReadAt(db, t0 + 60_000);
    const asNurse = await pushOutbox(db, connection, credentials, undefined, 'nurse');
    expect(asNurse).toMatchObject({ accepted: 1, rejected: 0, deferred: 1, deferredReason: 'This bed change waits for a charge nurse or unit admin to sign in to the unit server on this tablet: only they can send bed changes.' });
    expect(server.batchSizes).toEqual([1]);
    const bedRow = (await db.outbox.toArray()).find((r) => r.kind === 'bed.put');
    expect(bedRow).toMatchObject({ status: 'pending', attempts: 0 });
    const asAdmin = await pushOutbox(db, connection, { sessionToken: server.sessionFor(adminCy.id), deviceToken: 'device-token-1' }, undefined, 'unit-admin');
    expect(asAdmin).toMatchObject({ accepted: 1, deferred: 0 });
    expect((await db.outbox.get(bedRow!.seq!))?.status).toBe('accepted');
  });

  it('holds back unit settings for anyone but a unit admin', () => {
    expect(waitsForRole('unit.put', 'charge-nurse')).toMatch(/^This unit settings change waits for a unit admin/);
    expect(waitsForRole('unit.put', 'unit-admin')).toBeNull();
    expect(waitsForRole('bed.put', 'charge-nurse')).toBeNull();
    expect(waitsForRole('read.sign', 'nurse')).toBeNull();
    expect(waitsForRole('stay.put', 'nurse')).toBeNull();
  });

  it('sends nothing when nothing waits', async () => {
    const { server, db, connection, credentials } = await setUp();
    expect(await pushOutbox(db, connection, credentials)).toEqual({ batches: 0, accepted: 0, rejected: 0, deferred: 0, deferredReason: null });
    expect(server.pushRequests).toBe(0);
  });
});

describe('rejectReasonOf', () => {
  it('prefers the server reason, then its field messages, and is never empty', () => {
    expect(rejectReasonOf({ reason: 'Stay has ended.' })).toBe('Stay has ended.');
    expect(rejectReasonOf({ errors: [{ field: 'counts.qtSmallBoxes', message: 'qtSmallBoxes must be between 3 and 25 small boxes' }] })).toBe('qtSmallBoxes must be between 3 and 25 small boxes');
    expect(rejectReasonOf({ reason: '  ' })).toMatch(/refused this change without giving a reason/);
  });
});
