import type { NewAuditEvent } from '../storage/store.ts';

/** An audit event with every optional part empty unless given. */
export function auditEntry(fields: Pick<NewAuditEvent, 'kind' | 'serverTimeMs'> & Partial<NewAuditEvent>): NewAuditEvent {
  return {
    unitId: null,
    userId: null,
    username: null,
    recordId: null,
    deviceId: null,
    clientTimeMs: null,
    detail: null,
    ...fields,
  };
}
