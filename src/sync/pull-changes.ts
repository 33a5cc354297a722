import type { RhythmDb } from '../store/db.ts';
import type { ApplySummary } from './apply-server-changes.ts';
import { applyServerChanges, syncWriteTables } from './apply-server-changes.ts';
import type { CallCredentials, ServerConnection } from './server-call.ts';
import { callServer } from './server-call.ts';
import { SyncError, isServerRestored, serverRestoredError } from './sync-error.ts';
import type { PulledChange, PullResponse } from './sync-protocol.ts';
import { pullPageLimit, pullResponseSchema } from './sync-protocol.ts';
import type { StoredCursor } from './sync-settings.ts';
import { cursorKey, readSyncSetting, writeSyncSetting } from './sync-settings.ts';

/** What one pull did. */
export interface PullSummary extends ApplySummary {
  pages: number;
  received: number;
  cursor: number | string;
}

/** The cursor a pull of this unit starts from: where the last one stopped, or the very beginning. */
export async function storedCursor(db: RhythmDb, unitId: string): Promise<number | string> {
  const stored = await readSyncSetting<StoredCursor>(db, cursorKey);
  return stored && stored.unitId === unitId ? stored.cursor : 0;
}

/**
 * The cursor after a page. It never moves past the last change the tablet actually received: the
 * server promises no gaps, and the tablet adds its own guard by taking the smaller of the server's
 * cursor and the highest seq in the page, so a change committed late behind a higher seq is still
 * asked for next time. An empty page never moves the cursor. Opaque (text) cursors are the
 * server's to keep honest and are taken as given when the page held changes.
 */
export function nextCursor(current: number | string, page: Pick<PullResponse, 'changes' | 'cursor'>): number | string {
  if (page.changes.length === 0) return current;
  const highestSeq = Math.max(...page.changes.map((c) => c.seq));
  if (typeof page.cursor !== 'number') return page.cursor;
  const candidate = Math.min(page.cursor, highestSeq);
  return typeof current === 'number' ? Math.max(current, candidate) : candidate;
}

/** Most pages one pull takes before stopping (a server that always says "more" cannot hold the tablet forever). */
export const maxPagesPerPull = 10_000;

/** Sees every page of fresh changes as it is applied (the restore recovery uses it to learn what the server holds). */
export type PulledPageObserver = (changes: readonly PulledChange[]) => void;

/**
 * Whether the server's log still holds, at the tablet's cursor, the very change the tablet
 * received there. A server restored from a backup forgets changes; once tablets push again it
 * hands their numbers out anew, so a plain cursor check would pass and the tablet would silently
 * skip the new changes under those numbers and never re-send what the server lost. An answer
 * without change ids cannot be checked and is taken as it is.
 */
export function anchorStillHolds(changes: readonly PulledChange[], cursor: number, anchorChangeId: string): boolean {
  const atCursor = changes.find((c) => c.seq === cursor);
  if (!atCursor) return false;
  return atCursor.changeId === undefined || atCursor.changeId === anchorChangeId;
}

/**
 * Pulls the unit's changes after the stored cursor, page by page until the server has no more.
 * Each page's records and the cursor after it are written in one transaction: a crash or a lost
 * connection mid-pull leaves the cursor where the records end, never ahead of them.
 * The first page also asks again for the change at the cursor, to notice a server restored from a
 * backup (see anchorStillHolds); that, or the server's own 409 cursor-ahead, ends the pull with a
 * SyncError for which isServerRestored is true.
 */
export async function pullChanges(
  db: RhythmDb,
  connection: ServerConnection,
  credentials: CallCredentials,
  unitId: string,
  limit: number = pullPageLimit,
  observe?: PulledPageObserver,
): Promise<PullSummary> {
  const stored = await readSyncSetting<StoredCursor>(db, cursorKey);
  let cursor: number | string = stored && stored.unitId === unitId ? stored.cursor : 0;
  let anchor = stored && stored.unitId === unitId ? stored.anchorChangeId : undefined;
  const summary: PullSummary = { pages: 0, received: 0, cursor, applied: 0, alreadyNewer: 0, held: 0, readsAdded: 0, readsConfirmed: 0 };
  for (let page = 0; page < maxPagesPerPull; page += 1) {
    const checking = page === 0 && typeof cursor === 'number' && cursor > 0 && anchor !== undefined;
    const askAfter = checking ? (cursor as number) - 1 : cursor;
    const query = `after=${encodeURIComponent(String(askAfter))}&limit=${limit}`;
    let answer: PullResponse;
    try {
      answer = (await callServer(connection, { method: 'GET', path: `/api/sync/pull?${query}`, credentials, schema: pullResponseSchema })) as PullResponse;
    } catch (error) {
      if (isServerRestored(error)) throw serverRestoredError();
      throw error;
    }
    if (checking && !anchorStillHolds(answer.changes, cursor as number, anchor!)) throw serverRestoredError();
    // Changes at or before the cursor are already on the tablet; applying them again would be harmless but is skipped.
    const fresh = typeof cursor === 'number' ? answer.changes.filter((c) => c.seq > (cursor as number)) : answer.changes;
    const after = nextCursor(cursor, { changes: fresh, cursor: answer.cursor });
    if (after !== cursor) anchor = typeof after === 'number' ? fresh.find((c) => c.seq === after)?.changeId : undefined;
    const position: StoredCursor = { unitId, cursor: after, ...(anchor === undefined ? {} : { anchorChangeId: anchor }) };
    const applied = await db.transaction('rw', [...syncWriteTables], async () => {
      const result = await applyServerChanges(db, fresh);
      await writeSyncSetting(db, cursorKey, position);
      return result;
    });
    observe?.(fresh);
    summary.pages += 1;
    summary.received += fresh.length;
    summary.applied += applied.applied;
    summary.alreadyNewer += applied.alreadyNewer;
    summary.held += applied.held;
    summary.readsAdded += applied.readsAdded;
    summary.readsConfirmed += applied.readsConfirmed;
    const moved = after !== cursor;
    cursor = after;
    summary.cursor = cursor;
    if (!answer.hasMore) return summary;
    // A first page that held only the change at the cursor (a page limit of 1) simply asks again from the cursor.
    if (!moved && !checking) throw new SyncError('malformed', 'The unit server said more changes were waiting but sent none after the cursor; the tablet will ask again later.');
  }
  return summary;
}
