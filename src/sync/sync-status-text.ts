import { localClockText, localDateTimeText } from '../core/zoned-time-text.ts';
import type { SyncErrorKind } from './sync-error.ts';
import type { SyncState } from './sync-engine.ts';

/** How the status line reads: its words, and a tone the screen may colour (the words alone carry the meaning). */
export interface SyncStatusText {
  /** The whole line as shown. */
  line: string;
  /** The line without the retry countdown: what a screen reader announces when it changes. */
  text: string;
  /** "retrying in 30 s" while a retry after a failure is planned, else null. */
  retryText: string | null;
  tone: 'ok' | 'waiting' | 'problem';
}

const shortReason: Record<SyncErrorKind, string> = {
  unreachable: 'offline',
  timeout: 'the unit server is slow to answer',
  'signed-out': 'not signed in',
  'not-allowed': 'this tablet is not allowed on the unit server',
  'rate-limited': 'the unit server is busy',
  server: 'the unit server has a problem',
  refused: 'the unit server refused the request',
  malformed: "the unit server's answer was not understood",
  'not-yet': 'some wait for earlier changes to reach the unit server',
};

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "in 30 s", "in 4 min", or "now" for a wait already over. */
export function waitText(untilMs: number, nowMs: number): string {
  const seconds = Math.ceil((untilMs - nowMs) / 1000);
  if (seconds <= 0) return 'now';
  if (seconds < 90) return `in ${seconds} s`;
  return `in ${Math.round(seconds / 60)} min`;
}

function lastSyncedText(state: SyncState, nowMs: number, timeZone: string): string {
  if (state.lastSyncedAtMs === null) return 'not yet synced with the unit server';
  // Within the day the clock time is clear; older than that the date is needed too.
  const sameDay = nowMs - state.lastSyncedAtMs < 20 * 3_600_000;
  return `last synced ${sameDay ? localClockText(state.lastSyncedAtMs, timeZone) : localDateTimeText(state.lastSyncedAtMs, timeZone)}`;
}

/** How long after a restore recovery ends the sync line still mentions it. */
export const restoreNoticeAfterDoneMs = 60 * 60_000;

/** The sentence about a unit server restore, or null when there is nothing to say. */
export function restoreText(restore: SyncState['restore'], nowMs: number): string | null {
  if (!restore) return null;
  if (restore.phase !== 'done') return 'The unit server was restored from a backup; this tablet is re-sending its reads';
  if (restore.doneAtMs === null || nowMs - restore.doneAtMs > restoreNoticeAfterDoneMs) return null;
  if (restore.resentCount === 0) return 'The unit server was restored from a backup; it still held everything from this tablet';
  return `The unit server was restored from a backup; this tablet re-sent ${plural(restore.resentCount, 'change', 'changes')} it had lost`;
}

/**
 * The always-visible sync line, most urgent fact first: refused changes (the nurse has to act),
 * then a unit server restore, then sign-in, then waiting changes and why, then all clear.
 */
export function syncStatusText(state: SyncState, nowMs: number, timeZone: string): SyncStatusText {
  const parts: string[] = [];
  let tone: SyncStatusText['tone'] = 'ok';
  if (state.rejectedCount > 0) {
    const what = state.rejectedReadCount === state.rejectedCount ? plural(state.rejectedCount, 'read', 'reads') : plural(state.rejectedCount, 'change', 'changes');
    parts.push(`${what} refused by the server — open ${state.rejectedCount === 1 ? 'it' : 'them'} to see why`);
    tone = 'problem';
  }
  const restore = restoreText(state.restore, nowMs);
  if (restore) {
    parts.push(restore);
    if (tone === 'ok' && state.restore?.phase !== 'done') tone = 'waiting';
  }
  const waiting = state.pendingCount > 0 ? `${state.pendingCount} waiting to send` : null;
  // With the browser itself offline, the return of the network starts the next try, whatever the
  // backoff says; a countdown would only suggest the tablet is doing something it cannot.
  const offlineNow = !state.online && state.lastErrorKind === 'unreachable';
  const retryText = state.signedIn && !state.running && !offlineNow && state.nextRetryAtMs !== null && state.lastError !== null ? `retrying ${waitText(state.nextRetryAtMs, nowMs)}` : null;
  if (!state.signedIn) {
    parts.push(waiting ? `${waiting} — sign in to the unit server to send them` : `Not signed in to the unit server · ${lastSyncedText(state, nowMs, timeZone)}`);
    if (tone === 'ok') tone = 'waiting';
  } else if (state.running) {
    parts.push(waiting ? `Sending ${state.pendingCount}…` : 'Checking the unit server for changes…');
    if (tone === 'ok') tone = 'waiting';
  } else if (state.lastError !== null && state.lastErrorKind !== null) {
    const reason = shortReason[state.lastErrorKind];
    const waitingReason = offlineNow ? 'offline; they send by themselves when the network is back' : reason;
    parts.push(waiting ? `${waiting} — ${waitingReason}` : `All reads sent · ${lastSyncedText(state, nowMs, timeZone)} — ${reason}`);
    if (tone === 'ok') tone = 'waiting';
  } else if (waiting) {
    parts.push(`${waiting} · ${lastSyncedText(state, nowMs, timeZone)}`);
    if (tone === 'ok') tone = 'waiting';
  } else if (state.rejectedCount === 0) {
    // A refused change already seen is still not on the server, so the line does not claim everything went.
    parts.push(`${(state.seenRejectedCount ?? 0) > 0 ? 'Nothing waiting to send' : 'All reads sent'} · ${lastSyncedText(state, nowMs, timeZone)}`);
  } else {
    parts.push(lastSyncedText(state, nowMs, timeZone));
  }
  const joined = parts.join(' · ');
  const text = joined.charAt(0).toUpperCase() + joined.slice(1);
  return { line: retryText ? `${text}, ${retryText}` : text, text, retryText, tone };
}
