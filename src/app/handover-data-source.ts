import type { SyncState } from '../sync/sync-engine.ts';
import { clockText, dayClockText } from './time-text.ts';

/** Where the desk's beds come from, in words, and whether the charge nurse should worry about it. */
export interface DataSourceText {
  text: string;
  tone: 'ok' | 'waiting';
}

/**
 * The desk shows every tablet's reads only after this tablet has pulled them from the unit server,
 * so it says where its data comes from and how fresh it is; in the demo ward or without a server it
 * says plainly that only this tablet's records are shown.
 */
export function dataSourceText(state: SyncState | null, demoWard: boolean, nowMs: number, timeZone: string): DataSourceText {
  if (demoWard || state === null) return { text: 'This tablet only — not connected to a unit server', tone: 'waiting' };
  if (state.lastSyncedAtMs === null) return { text: 'Not yet synced with the unit server: only reads made on this tablet are shown', tone: 'waiting' };
  const sameDay = nowMs - state.lastSyncedAtMs < 20 * 3_600_000;
  const when = sameDay ? clockText(state.lastSyncedAtMs, timeZone) : dayClockText(state.lastSyncedAtMs, timeZone);
  const stale = !state.signedIn || state.lastError !== null;
  const why = !state.signedIn ? ' (signed out of the unit server: newer reads from other tablets may be missing)' : state.lastError !== null ? ' (the last try failed: newer reads from other tablets may be missing)' : '';
  return { text: `Data from the unit server, last synced ${when}${why}`, tone: stale ? 'waiting' : 'ok' };
}
