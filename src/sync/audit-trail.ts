import { z } from 'zod';
import type { CallCredentials, ServerConnection } from './server-call.ts';
import { callServer } from './server-call.ts';

/** One audit event as the unit server returns it: who, what, which record, which tablet, both clocks. No patient data. */
export const auditEventSchema = z.object({
  id: z.number().int().positive(),
  unitId: z.string().nullable(),
  kind: z.string().min(1),
  userId: z.string().nullable(),
  username: z.string().nullable(),
  recordId: z.string().nullable(),
  deviceId: z.string().nullable(),
  clientTimeMs: z.number().nullable(),
  serverTimeMs: z.number(),
  detail: z.string().nullable(),
});
/** A validated audit event. */
export type AuditEvent = z.infer<typeof auditEventSchema>;

const auditPageSchema = z.object({ events: z.array(auditEventSchema) });

/** An account as the unit admin's list shows it, for naming who did what. */
export const auditAccountSchema = z.looseObject({ id: z.string(), name: z.string(), username: z.string(), role: z.string() });
/** A validated account. */
export type AuditAccount = z.infer<typeof auditAccountSchema>;

/** An enrolled tablet, for naming where it happened. */
export const auditDeviceSchema = z.looseObject({ id: z.string(), label: z.string() });
/** A validated tablet. */
export type AuditDevice = z.infer<typeof auditDeviceSchema>;

/** What the unit admin filters the trail by; times are epoch ms, both ends included. */
export interface AuditFilter {
  kind?: string;
  userId?: string;
  fromMs?: number;
  toMs?: number;
  /** Only events older than this event id (the next page back). */
  beforeId?: number;
}

/** One page of the trail, newest first, and whether older events remain. */
export interface AuditPage {
  events: AuditEvent[];
  hasOlder: boolean;
}

/** The query string of `GET /api/audit` for a filter; one more event than the page is asked for, to know whether older ones remain. */
export function auditQuery(filter: AuditFilter, pageSize: number): string {
  const params = new URLSearchParams();
  if (filter.kind) params.set('kind', filter.kind);
  if (filter.userId) params.set('userId', filter.userId);
  if (filter.fromMs !== undefined) params.set('from', String(Math.max(0, Math.floor(filter.fromMs))));
  if (filter.toMs !== undefined) params.set('to', String(Math.max(0, Math.floor(filter.toMs))));
  if (filter.beforeId !== undefined) params.set('before', String(filter.beforeId));
  params.set('limit', String(pageSize + 1));
  return params.toString();
}

/** One page of the unit's audit trail (unit admins only; the server refuses anyone else). */
export async function fetchAuditPage(connection: ServerConnection, credentials: CallCredentials, filter: AuditFilter, pageSize: number): Promise<AuditPage> {
  const answer = await callServer(connection, { method: 'GET', path: `/api/audit?${auditQuery(filter, pageSize)}`, credentials, schema: auditPageSchema });
  return { events: answer.events.slice(0, pageSize), hasOlder: answer.events.length > pageSize };
}

/** The unit's accounts, to name who did what. */
export async function fetchAuditAccounts(connection: ServerConnection, credentials: CallCredentials): Promise<AuditAccount[]> {
  return (await callServer(connection, { method: 'GET', path: '/api/users', credentials, schema: z.object({ users: z.array(auditAccountSchema) }) })).users;
}

/** The unit's enrolled tablets, to name where it happened. */
export async function fetchAuditDevices(connection: ServerConnection, credentials: CallCredentials): Promise<AuditDevice[]> {
  return (await callServer(connection, { method: 'GET', path: '/api/devices', credentials, schema: z.object({ devices: z.array(auditDeviceSchema) }) })).devices;
}
