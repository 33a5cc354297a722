import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { auditEntry } from '../audit/audit-entry.ts';
import { authOf } from '../auth/access-guard.ts';
import { parseInput } from '../parse-input.ts';
import type { AuditFilter, Store } from '../storage/store.ts';

const wholeMs = (field: string) => z.string().regex(/^\d{1,15}$/, `${field} must be a time in epoch milliseconds`).transform(Number);

const auditQuerySchema = z.strictObject({
  kind: z.string().min(1).max(60, 'kind must be at most 60 characters').optional(),
  userId: z.string().min(1).max(64, 'userId must be at most 64 characters').optional(),
  from: wholeMs('from').optional(),
  to: wholeMs('to').optional(),
  before: z.string().regex(/^\d{1,15}$/, 'before must be an event id from an earlier page').transform(Number).optional(),
  limit: z
    .string()
    .regex(/^\d{1,4}$/, 'limit must be a whole number from 1 to 1000')
    .default('200')
    .transform(Number)
    .refine((n) => n >= 1 && n <= 1000, { message: 'limit must be a whole number from 1 to 1000', params: { min: 1, max: 1000 } }),
});

const exportBodySchema = z.strictObject(
  {
    format: z.enum(['fhir', 'csv', 'print', 'pdf'], { error: 'format must be fhir, csv, print or pdf' }),
    // Ids and counts only: the audit trail names records, never patients.
    scope: z.enum(['read', 'stay', 'bed', 'shift', 'unit'], { error: 'scope must be read, stay, bed, shift or unit' }),
    recordId: z.string({ error: 'recordId must be text' }).min(1).max(64, 'recordId must be at most 64 characters').optional(),
    recordCount: z.number({ error: 'recordCount must be a number' }).int('recordCount must be a whole number').min(0).max(1_000_000),
    clientTimeMs: z.number({ error: 'clientTimeMs must be a number' }).int().min(0).max(8.64e15),
  },
  { error: (issue) => (issue.code === 'invalid_type' ? 'body must be a JSON object' : undefined) },
);

/** The audit trail: unit admins read and filter it; any clinician's tablet reports the exports it made. */
export function registerAuditRoutes(app: FastifyInstance, { store, nowMs }: { store: Store; nowMs: () => number }): void {
  app.get('/api/audit', { config: { roles: ['unit-admin'] } }, async (request) => {
    const { user } = authOf(request);
    const query = parseInput(auditQuerySchema, request.query);
    const filter: AuditFilter = { unitId: user.unitId, limit: query.limit };
    if (query.kind !== undefined) filter.kind = query.kind;
    if (query.userId !== undefined) filter.userId = query.userId;
    if (query.from !== undefined) filter.fromMs = query.from;
    if (query.to !== undefined) filter.toMs = query.to;
    if (query.before !== undefined) filter.beforeId = query.before;
    return { events: await store.listAudit(filter) };
  });

  app.post('/api/audit/exports', async (request, reply) => {
    const { user, device } = authOf(request);
    const body = parseInput(exportBodySchema, request.body);
    await store.appendAudit(
      auditEntry({
        kind: 'export',
        serverTimeMs: nowMs(),
        clientTimeMs: body.clientTimeMs,
        unitId: user.unitId,
        userId: user.id,
        username: user.username,
        deviceId: device?.id ?? null,
        recordId: body.recordId ?? null,
        detail: `${body.format} of ${body.scope}: ${body.recordCount} record(s)`,
      }),
    );
    return reply.code(204).send();
  });
}
