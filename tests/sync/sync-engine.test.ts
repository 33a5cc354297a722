import { describe, expect, it, vi } from 'vitest';
import { currentSession } from '../../src/sync/server-session.ts';
import { syncStatusText } from '../../src/sync/sync-status-text.ts';
import type { SyncState } from '../../src/sync/sync-engine.ts';
import { ManualClock, engineFor, newServer, newTablet, nurseAsh, readCounts, signInTablet, signReadAt, t0 } from './sync-fixtures.ts';

async function setUp() {
  const server = await newServer();
  const clock = new ManualClock(t0);
  const db = await newTablet();
  await signInTablet(db, server, nurseAsh.id);
  return { server, clock, db };
}

describe('sync engine', () => {
  it('shares one run between concurrent triggers: three calls, one push, one pull', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    const engine = await engineFor(db, server, clock);
    const runs = [engine.syncNow(), engine.syncNow(), engine.syncNow()];
    expect(runs[1]).toBe(runs[0]);
    expect(runs[2]).toBe(runs[0]);
    const results = await Promise.all(runs);
    expect(results.every((r) => r.ok)).toBe(true);
    expect(server.pushRequests).toBe(1);
    expect(server.pullRequests).toBe(1);
    expect(server.reads.size).toBe(1);
    // Once the shared run is over, a new call starts a new run.
    await engine.syncNow();
    expect(server.pullRequests).toBe(2);
  });

  it('reports the state: waiting count before, then last synced, nothing waiting and no error', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    await signReadAt(db, t0 + 60_000);
    const engine = await engineFor(db, server, clock);
    const seen: SyncState[] = [];
    engine.subscribe((s) => seen.push(s));
    await engine.refresh();
    expect(engine.getState()).toMatchObject({ pendingCount: 2, signedIn: true, lastSyncedAtMs: null });
    clock.nowMs = t0 + 5 * 60_000;
    await engine.syncNow();
    expect(engine.getState()).toMatchObject({ pendingCount: 0, rejectedCount: 0, lastError: null, running: false, lastSyncedAtMs: t0 + 5 * 60_000 });
    expect(seen.some((s) => s.running)).toBe(true);
    expect(syncStatusText(engine.getState(), clock.nowMs, 'Europe/London').line).toBe('All reads sent · last synced 08:05');
  });

  it('retries after failures with growing, jittered waits, and succeeds once the server is back', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    server.injectPushFault({ kind: 'status', status: 503 });
    server.injectPushFault({ kind: 'status', status: 502 });
    server.injectPushFault({ kind: 'status', status: 500 });
    const engine = await engineFor(db, server, clock, { random: () => 0.75 });
    engine.start();
    await vi.waitFor(() => expect(engine.getState()).toMatchObject({ failuresInRow: 1, running: false }));
    const waits: number[] = [];
    for (let i = 0; i < 3; i += 1) {
      const next = clock.nextTimerAtMs()!;
      waits.push(next - clock.nowMs);
      clock.advance(next - clock.nowMs);
      await engine.syncNow();
    }
    // Full jitter at 0.75 of a ceiling doubling from 2 s: 1.5 s, 3 s, 6 s (common practice, no source).
    expect(waits).toEqual([1_500, 3_000, 6_000]);
    expect(server.pushRequests).toBe(4);
    expect(engine.getState()).toMatchObject({ failuresInRow: 0, lastError: null, pendingCount: 0 });
    expect((await db.outbox.toArray())[0]).toMatchObject({ status: 'accepted', attempts: 4 });
    // Healthy again: the next run is planned on the interval.
    expect(clock.nextTimerAtMs()! - clock.nowMs).toBe(60_000);
    engine.stop();
    expect(clock.pendingTimers()).toBe(0);
  });

  it('says why it waits while failing: "1 waiting to send — the unit server has a problem, retrying in 2 s"', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    server.injectPushFault({ kind: 'status', status: 503 });
    const engine = await engineFor(db, server, clock, { random: () => 0.9999 });
    engine.start();
    await vi.waitFor(() => expect(engine.getState().lastError).not.toBeNull());
    await vi.waitFor(() => expect(engine.getState().running).toBe(false));
    expect(syncStatusText(engine.getState(), clock.nowMs, 'Europe/London').line).toBe('1 waiting to send — the unit server has a problem, retrying in 2 s');
    engine.stop();
  });

  it('resumes by itself when the network returns, without waiting out the backoff', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    let online = false;
    const events = new EventTarget();
    const engine = await engineFor(db, server, clock, { isOnline: () => online, events });
    engine.start();
    await vi.waitFor(() => expect(engine.getState().lastErrorKind).toBe('unreachable'));
    await vi.waitFor(() => expect(engine.getState().running).toBe(false));
    expect(server.pushRequests).toBe(0);
    expect(engine.getState()).toMatchObject({ pendingCount: 1, online: false });
    online = true;
    events.dispatchEvent(new Event('online'));
    await engine.syncNow();
    expect(server.pushRequests).toBe(1);
    expect(await readCounts(db)).toEqual({ all: 1, accepted: 1, pending: 0, rejected: 0 });
    expect(engine.getState()).toMatchObject({ online: true, pendingCount: 0, lastError: null });
    engine.stop();
  });

  it('stops on an ended session (401): asks for sign-in, keeps every row waiting, plans no retry', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    await signReadAt(db, t0 + 60_000);
    server.expireSessions();
    const events = new EventTarget();
    const engine = await engineFor(db, server, clock, { events });
    engine.start();
    await vi.waitFor(() => expect(engine.getState().lastErrorKind).toBe('signed-out'));
    await vi.waitFor(() => expect(engine.getState().running).toBe(false));
    expect(engine.getState()).toMatchObject({ signedIn: false, pendingCount: 2, nextRetryAtMs: null });
    expect(clock.pendingTimers()).toBe(0);
    expect(await currentSession(db)).toBeNull();
    expect((await db.outbox.toArray()).map((r) => [r.status, r.attempts])).toEqual([['pending', 0], ['pending', 0]]);
    expect(syncStatusText(engine.getState(), clock.nowMs, 'Europe/London').line).toBe('2 waiting to send — sign in to the unit server to send them');
    // The network coming back does not start a run that would fail the same way.
    events.dispatchEvent(new Event('online'));
    expect(engine.getState().running).toBe(false);
    expect(server.requests).toBe(1);
    // After a new sign-in everything goes.
    await signInTablet(db, server, nurseAsh.id);
    await engine.refresh();
    await engine.syncNow();
    expect(await readCounts(db)).toEqual({ all: 2, accepted: 2, pending: 0, rejected: 0 });
    engine.stop();
  });

  it('counts refused reads and names them in the status line', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0, { notes: 'refuse' });
    await signReadAt(db, t0 + 60_000);
    server.rejectWhen = (change) => (change.kind === 'read.sign' && change.record.notes === 'refuse' ? 'This bed has no monitoring at that time.' : null);
    const engine = await engineFor(db, server, clock);
    await engine.syncNow();
    expect(engine.getState()).toMatchObject({ rejectedCount: 1, rejectedReadCount: 1, pendingCount: 0 });
    expect(syncStatusText(engine.getState(), clock.nowMs, 'Europe/London')).toMatchObject({ line: '1 read refused by the server — open it to see why · last synced 08:00', tone: 'problem' });
  });

  it('backs off, rather than resending every few seconds, while the server defers a change', async () => {
    const { server, clock, db } = await setUp();
    await signReadAt(db, t0);
    server.rejectWhen = () => ({ reason: 'The patient stay this read belongs to has not reached the server yet.', retryable: true });
    const engine = await engineFor(db, server, clock, { random: () => 0.5 });
    engine.start();
    await vi.waitFor(() => expect(engine.getState()).toMatchObject({ failuresInRow: 1, running: false }));
    expect(engine.getState()).toMatchObject({ lastErrorKind: 'not-yet', pendingCount: 1, lastSyncedAtMs: t0 });
    expect(syncStatusText(engine.getState(), clock.nowMs, 'Europe/London').line).toBe('1 waiting to send — some wait for earlier changes to reach the unit server, retrying in 1 s');
    clock.advance(clock.nextTimerAtMs()! - clock.nowMs);
    await engine.syncNow();
    // Ceiling 4 s after the second deferral, at 0.5: 2 s.
    expect(clock.nextTimerAtMs()! - clock.nowMs).toBe(2_000);
    server.rejectWhen = null;
    clock.advance(2_000);
    await engine.syncNow();
    expect(engine.getState()).toMatchObject({ failuresInRow: 0, lastError: null, pendingCount: 0 });
    expect(server.reads.size).toBe(1);
    engine.stop();
  });

  it('sends a newly saved read soon after it is saved, by watching the outbox', async () => {
    const { server, clock, db } = await setUp();
    const engine = await engineFor(db, server, clock, { watchOutbox: true, soonDelayMs: 1_500 });
    engine.start();
    await vi.waitFor(() => expect(engine.getState().lastSyncedAtMs).toBe(t0));
    await signReadAt(db, t0 + 10_000);
    await vi.waitFor(() => expect(engine.getState().pendingCount).toBe(1));
    await vi.waitFor(() => expect(clock.nextTimerAtMs()).toBe(t0 + 1_500));
    clock.advance(1_500);
    await engine.syncNow();
    expect(server.reads.size).toBe(1);
    expect(await readCounts(db)).toMatchObject({ all: 1, accepted: 1 });
    engine.stop();
  });

  it('does nothing and asks for sign-in on a tablet that never signed in', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const db = await newTablet();
    const engine = await engineFor(db, server, clock);
    const result = await engine.syncNow();
    expect(result.ok).toBe(false);
    expect(engine.getState()).toMatchObject({ signedIn: false, lastErrorKind: 'signed-out' });
    expect(server.pushRequests + server.pullRequests).toBe(0);
  });
});

describe('browser wiring', () => {
  it('reaches the page origin by default and calls the server through the window fetch', async () => {
    const { browserConnection } = await import('../../src/sync/browser-sync-engine.ts');
    const calls: string[] = [];
    const original = globalThis.fetch;
    globalThis.fetch = (async (url: string) => {
      calls.push(url);
      return new Response(JSON.stringify({ status: 'ok' }), { status: 200, headers: { 'content-type': 'application/json' } });
    }) as typeof fetch;
    try {
      const { callServer } = await import('../../src/sync/server-call.ts');
      const { healthResponseSchema } = await import('../../src/sync/sync-protocol.ts');
      const answer = await callServer(browserConnection(), { method: 'GET', path: '/api/health', schema: healthResponseSchema });
      expect(answer.status).toBe('ok');
      expect(calls).toEqual(['/api/health']);
    } finally {
      globalThis.fetch = original;
    }
  });
});
