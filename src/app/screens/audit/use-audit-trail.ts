import { useEffect, useState } from 'preact/hooks';
import type { RhythmDb } from '../../../store/db.ts';
import type { AuditAccount, AuditDevice, AuditFilter, AuditPage } from '../../../sync/audit-trail.ts';
import { fetchAuditAccounts, fetchAuditDevices, fetchAuditPage } from '../../../sync/audit-trail.ts';
import type { ServerConnection } from '../../../sync/server-call.ts';
import { credentialsOf } from '../../../sync/server-session.ts';
import { SyncError } from '../../../sync/sync-error.ts';

/** What the audit screen shows of the server's answer. */
export type AuditLoad =
  | { state: 'loading' }
  | { state: 'shown'; page: AuditPage }
  /** `offline`: the server cannot be reached; otherwise it answered with a refusal the words explain. */
  | { state: 'failed'; offline: boolean; message: string };

/** The words for a failed audit call: never a raw error, always what the admin can do. */
export function auditFailureOf(error: unknown): { offline: boolean; message: string } {
  if (error instanceof SyncError) {
    if (error.kind === 'unreachable' || error.kind === 'timeout') {
      return { offline: true, message: 'The audit trail is kept on the unit server, and this tablet cannot reach it now (offline, or the server is down). Charting carries on as usual; try again when the network is back.' };
    }
    if (error.kind === 'signed-out') return { offline: false, message: 'The unit server session has ended. Sign in again as a unit admin to read the audit trail.' };
    if (error.kind === 'not-allowed') return { offline: false, message: 'The unit server refused: only a unit admin on an enrolled tablet can read the audit trail.' };
    if (error.errors.length > 0) return { offline: false, message: error.errors.map((e) => e.message).join(' ') };
    return { offline: false, message: error.message };
  }
  return { offline: false, message: 'The audit trail could not be shown; try again.' };
}

/**
 * Loads one page of the audit trail for a filter, newest first, with the accounts and tablets that
 * name its rows. Paging goes back by event id; `older()` and `newer()` move one page.
 */
export function useAuditTrail(db: RhythmDb, connection: ServerConnection, filter: AuditFilter | null, pageSize: number) {
  // Paging belongs to one filter: a new filter starts again from the newest page.
  const [paging, setPaging] = useState<{ filter: AuditFilter | null; starts: number[] }>({ filter, starts: [] });
  const pageStarts = paging.filter === filter ? paging.starts : [];
  const [load, setLoad] = useState<AuditLoad>({ state: 'loading' });
  const [attempt, setAttempt] = useState(0);
  const [accounts, setAccounts] = useState<AuditAccount[]>([]);
  const [devices, setDevices] = useState<AuditDevice[]>([]);
  const beforeId = pageStarts.at(-1);

  useEffect(() => {
    if (!filter) return undefined;
    let current = true;
    setLoad({ state: 'loading' });
    void (async () => {
      try {
        const credentials = await credentialsOf(db);
        if (!credentials) throw new SyncError('signed-out', 'signed out');
        const page = await fetchAuditPage(connection, credentials, beforeId === undefined ? filter : { ...filter, beforeId }, pageSize);
        if (current) setLoad({ state: 'shown', page });
      } catch (error) {
        if (current) setLoad({ state: 'failed', ...auditFailureOf(error) });
      }
    })();
    return () => {
      current = false;
    };
  }, [db, connection, filter, beforeId, pageSize, attempt]);

  useEffect(() => {
    if (!filter) return;
    // Names only make the rows easier to read; without them the ids are shown.
    void credentialsOf(db).then(async (credentials) => {
      if (!credentials) return;
      await fetchAuditAccounts(connection, credentials).then(setAccounts, () => undefined);
      await fetchAuditDevices(connection, credentials).then(setDevices, () => undefined);
    });
  }, [db, connection, filter === null, attempt]);

  const lastShownId = load.state === 'shown' ? load.page.events.at(-1)?.id : undefined;
  return {
    load,
    accounts,
    devices,
    pageNumber: pageStarts.length + 1,
    canGoOlder: load.state === 'shown' && load.page.hasOlder && lastShownId !== undefined,
    canGoNewer: pageStarts.length > 0,
    older: () => {
      if (lastShownId !== undefined) setPaging({ filter, starts: [...pageStarts, lastShownId] });
    },
    newer: () => setPaging({ filter, starts: pageStarts.slice(0, -1) }),
    retry: () => setAttempt((n) => n + 1),
  };
}
