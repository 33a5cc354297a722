import { z } from 'zod';
import type { RhythmDb } from '../store/db.ts';
import type { ServerConnection } from '../sync/server-call.ts';
import { callServer } from '../sync/server-call.ts';
import { credentialsOf } from '../sync/server-session.ts';
import { SyncError } from '../sync/sync-error.ts';

// Every export and printout is audited. A tablet with a unit server reports it at once
// (POST /api/audit/exports). Offline, or before anyone has signed in online, the report waits on the
// tablet in a queue and is sent, oldest first, after the next successful sync: the export itself
// never waits for the network. A tablet with no unit server (the demo ward, a ward running on one
// tablet) keeps the record on the tablet only, as there is no shared audit trail to send it to.
// Entries hold ids and counts only, never a patient alias.

/** One export as the unit server's audit trail records it (DEVELOPERS.md, POST /api/audit/exports). */
export interface ExportAuditEntry {
  format: 'fhir' | 'csv' | 'print' | 'pdf';
  scope: 'read' | 'stay' | 'bed' | 'shift' | 'unit';
  recordId?: string;
  recordCount: number;
  clientTimeMs: number;
}

/** What happened to an audit entry: sent to the server, queued for the next sync, or kept on this tablet only. */
export type ExportAuditOutcome = 'sent' | 'queued' | 'kept-on-tablet';

/** Settings keys of the two lists (read them in tests and on the audit screen). */
export const queuedExportAuditsKey = 'exportAudit.queued';
export const localExportAuditsKey = 'exportAudit.local';

async function append(db: RhythmDb, key: string, entry: ExportAuditEntry & { note?: string }): Promise<void> {
  await db.transaction('rw', db.settings, async () => {
    const list = ((await db.settings.get(key))?.value as ExportAuditEntry[] | undefined) ?? [];
    await db.settings.put({ key, value: [...list, entry] });
  });
}

async function post(db: RhythmDb, connection: ServerConnection, entry: ExportAuditEntry): Promise<void> {
  const credentials = await credentialsOf(db);
  if (!credentials) throw new SyncError('signed-out', 'Not signed in to the unit server.');
  await callServer(connection, { method: 'POST', path: '/api/audit/exports', body: entry, credentials, schema: z.unknown(), emptyStatus: 204 });
}

/** Records one export: with the server when it can, else queued (or, with no server, on the tablet). */
export async function recordExportAudit(db: RhythmDb, connection: ServerConnection | null, entry: ExportAuditEntry): Promise<ExportAuditOutcome> {
  if (connection === null) {
    await append(db, localExportAuditsKey, entry);
    return 'kept-on-tablet';
  }
  try {
    await post(db, connection, entry);
  } catch (error) {
    if (error instanceof SyncError && error.kind === 'refused') {
      // The server read the entry and refused it (a bad field): sending it again would fail the same way.
      await append(db, localExportAuditsKey, { ...entry, note: error.message });
      return 'kept-on-tablet';
    }
    await append(db, queuedExportAuditsKey, entry);
    return 'queued';
  }
  await sendQueuedExportAudits(db, connection);
  return 'sent';
}

/** Sends the queued entries oldest first, stopping at the first failure; returns how many were sent. */
export async function sendQueuedExportAudits(db: RhythmDb, connection: ServerConnection): Promise<number> {
  let sent = 0;
  for (;;) {
    const queued = ((await db.settings.get(queuedExportAuditsKey))?.value as ExportAuditEntry[] | undefined) ?? [];
    const next = queued[0];
    if (!next) return sent;
    try {
      await post(db, connection, next);
    } catch (error) {
      if (!(error instanceof SyncError && error.kind === 'refused')) return sent;
      await append(db, localExportAuditsKey, { ...next, note: error.message });
    }
    await db.transaction('rw', db.settings, async () => {
      const now = ((await db.settings.get(queuedExportAuditsKey))?.value as ExportAuditEntry[] | undefined) ?? [];
      await db.settings.put({ key: queuedExportAuditsKey, value: now.slice(1) });
    });
    sent += 1;
  }
}
