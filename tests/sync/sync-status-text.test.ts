import { describe, expect, it } from 'vitest';
import type { SyncState } from '../../src/sync/sync-engine.ts';
import { syncStatusText, waitText } from '../../src/sync/sync-status-text.ts';
import { t0 } from './sync-fixtures.ts';

const idle: SyncState = {
  lastSyncedAtMs: Date.UTC(2026, 2, 10, 14, 2),
  pendingCount: 0,
  rejectedCount: 0,
  rejectedReadCount: 0,
  seenRejectedCount: 0,
  restore: null,
  lastError: null,
  lastErrorKind: null,
  running: false,
  signedIn: true,
  online: true,
  nextRetryAtMs: null,
  failuresInRow: 0,
};
const nowMs = Date.UTC(2026, 2, 10, 14, 30);
const zone = 'Europe/London';

describe('syncStatusText', () => {
  it('says all is sent, with the last sync on the unit clock', () => {
    expect(syncStatusText(idle, nowMs, zone)).toEqual({ line: 'All reads sent · last synced 14:02', text: 'All reads sent · last synced 14:02', retryText: null, tone: 'ok' });
  });

  it('shows the unit wall clock, not UTC: 14:02 UTC is 15:02 in Berlin', () => {
    expect(syncStatusText(idle, nowMs, 'Europe/Berlin').line).toBe('All reads sent · last synced 15:02');
  });

  it('adds the date once the last sync is from an earlier day', () => {
    expect(syncStatusText(idle, nowMs + 30 * 3_600_000, zone).line).toBe('All reads sent · last synced 2026-03-10 14:02');
  });

  it('counts what waits, why, and when the next try is: "3 waiting to send — offline, retrying in 30 s"', () => {
    const state: SyncState = { ...idle, pendingCount: 3, lastError: 'This tablet is offline.', lastErrorKind: 'unreachable', nextRetryAtMs: nowMs + 30_000, failuresInRow: 4 };
    expect(syncStatusText(state, nowMs, zone)).toEqual({ line: '3 waiting to send — offline, retrying in 30 s', text: '3 waiting to send — offline', retryText: 'retrying in 30 s', tone: 'waiting' });
  });

  it('says the reads send by themselves once the network is back when the tablet itself is offline, with no countdown', () => {
    const state: SyncState = { ...idle, online: false, pendingCount: 2, lastError: 'This tablet is offline.', lastErrorKind: 'unreachable', nextRetryAtMs: nowMs + 2_000, failuresInRow: 1 };
    expect(syncStatusText(state, nowMs, zone)).toEqual({
      line: '2 waiting to send — offline; they send by themselves when the network is back',
      text: '2 waiting to send — offline; they send by themselves when the network is back',
      retryText: null,
      tone: 'waiting',
    });
  });

  it('puts refused reads first, since the nurse has to act on them', () => {
    const state: SyncState = { ...idle, rejectedCount: 1, rejectedReadCount: 1, pendingCount: 2 };
    expect(syncStatusText(state, nowMs, zone)).toMatchObject({ line: '1 read refused by the server — open it to see why · 2 waiting to send · last synced 14:02', tone: 'problem' });
  });

  it('says "changes" when what was refused is not only reads', () => {
    const state: SyncState = { ...idle, rejectedCount: 2, rejectedReadCount: 1 };
    expect(syncStatusText(state, nowMs, zone).line).toBe('2 changes refused by the server — open them to see why · last synced 14:02');
  });

  it('asks for sign-in when the session has ended, and does not promise a retry', () => {
    const state: SyncState = { ...idle, signedIn: false, pendingCount: 4, lastError: 'sign in', lastErrorKind: 'signed-out', nextRetryAtMs: nowMs + 5_000 };
    expect(syncStatusText(state, nowMs, zone)).toMatchObject({ line: '4 waiting to send — sign in to the unit server to send them', retryText: null, tone: 'waiting' });
  });

  it('says when nothing has ever been synced', () => {
    expect(syncStatusText({ ...idle, lastSyncedAtMs: null, signedIn: false }, nowMs, zone).line).toBe('Not signed in to the unit server · not yet synced with the unit server');
  });

  it('says what it is doing while a run is under way', () => {
    expect(syncStatusText({ ...idle, running: true, pendingCount: 5 }, nowMs, zone).line).toBe('Sending 5…');
    expect(syncStatusText({ ...idle, running: true }, nowMs, zone).line).toBe('Checking the unit server for changes…');
  });

  it('reports a failed check even when nothing waits', () => {
    const state: SyncState = { ...idle, lastError: 'slow', lastErrorKind: 'timeout', nextRetryAtMs: nowMs + 240_000 };
    expect(syncStatusText(state, nowMs, zone).line).toBe('All reads sent · last synced 14:02 — the unit server is slow to answer, retrying in 4 min');
  });
});

describe('the sync line after a unit server restore', () => {
  const restoring: SyncState['restore'] = { phase: 'sending', detectedAtMs: nowMs - 60_000, resentCount: 3, doneAtMs: null };

  it('says the tablet is re-sending while the recovery is under way, before what waits', () => {
    expect(syncStatusText({ ...idle, restore: restoring, pendingCount: 3 }, nowMs, zone)).toMatchObject({
      line: 'The unit server was restored from a backup; this tablet is re-sending its reads · 3 waiting to send · last synced 14:02',
      tone: 'waiting',
    });
  });

  it('says how many changes went again once done, for an hour, then says nothing more of it', () => {
    const done: SyncState['restore'] = { ...restoring, phase: 'done', doneAtMs: nowMs - 10 * 60_000 };
    expect(syncStatusText({ ...idle, restore: done }, nowMs, zone)).toMatchObject({
      line: 'The unit server was restored from a backup; this tablet re-sent 3 changes it had lost · All reads sent · last synced 14:02',
      tone: 'ok',
    });
    expect(syncStatusText({ ...idle, restore: { ...done, resentCount: 0 } }, nowMs, zone).line).toBe(
      'The unit server was restored from a backup; it still held everything from this tablet · All reads sent · last synced 14:02',
    );
    expect(syncStatusText({ ...idle, restore: done }, nowMs + 51 * 60_000, zone).line).toBe('All reads sent · last synced 14:02');
  });

  it('still puts refused reads first', () => {
    expect(syncStatusText({ ...idle, restore: restoring, rejectedCount: 1, rejectedReadCount: 1 }, nowMs, zone).line).toMatch(/^1 read refused by the server — open it to see why · The unit server was restored/);
  });
});

describe('refused changes already seen', () => {
  it('no longer count as news: the line is calm, does not claim every read went, and counts only unseen ones', () => {
    expect(syncStatusText({ ...idle, seenRejectedCount: 2 }, nowMs, zone)).toMatchObject({ line: 'Nothing waiting to send · last synced 14:02', tone: 'ok' });
    expect(syncStatusText({ ...idle, seenRejectedCount: 2, rejectedCount: 1, rejectedReadCount: 1 }, nowMs, zone).line).toBe('1 read refused by the server — open it to see why · last synced 14:02');
  });
});

describe('waitText', () => {
  it('rounds up to whole seconds under 90 s, then to minutes', () => {
    expect(waitText(t0 + 29_001, t0)).toBe('in 30 s');
    expect(waitText(t0 + 89_000, t0)).toBe('in 89 s');
    expect(waitText(t0 + 150_000, t0)).toBe('in 3 min');
  });

  describe('edge cases', () => {
    it('says "now" for a time already passed or exactly now', () => {
      expect(waitText(t0, t0)).toBe('now');
      expect(waitText(t0 - 5_000, t0)).toBe('now');
    });
  });
});
