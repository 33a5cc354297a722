import { randomUUID } from 'node:crypto';
import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { auditEntry } from '../audit/audit-entry.ts';
import { authOf } from '../auth/access-guard.ts';
import { newOpaqueToken, tokenHash } from '../auth/opaque-token.ts';
import { notFound } from '../http-error.ts';
import { parseInput } from '../parse-input.ts';
import type { DeviceRecord, Store } from '../storage/store.ts';

const enrollBodySchema = z.strictObject(
  { label: z.string({ error: 'label must be text' }).trim().min(1, 'label is required (e.g. "Tablet 2, bay B")').max(60, 'label must be at most 60 characters') },
  { error: (issue) => (issue.code === 'invalid_type' ? 'body must be an object with a label' : undefined) },
);
const deviceIdSchema = z.strictObject({ id: z.string().min(1).max(64, 'id must be at most 64 characters') });

const adminOnly = ['unit-admin'] as const;

const deviceView = (d: DeviceRecord) => ({ id: d.id, label: d.label, enrolledBy: d.enrolledBy, enrolledAtMs: d.enrolledAtMs, revokedAtMs: d.revokedAtMs });

/** Tablet enrolment by a unit admin: the device token is shown once and stored only as a hash. */
export function registerDeviceRoutes(app: FastifyInstance, { store, nowMs }: { store: Store; nowMs: () => number }): void {
  app.post('/api/devices/enroll', { config: { access: 'session', roles: adminOnly } }, async (request) => {
    const { user, session } = authOf(request);
    const { label } = parseInput(enrollBodySchema, request.body);
    const atMs = nowMs();
    const deviceToken = newOpaqueToken();
    const deviceId = randomUUID();
    await store.createDevice({ id: deviceId, unitId: user.unitId, label, tokenHash: tokenHash(deviceToken), enrolledBy: user.id, enrolledAtMs: atMs, revokedAtMs: null });
    // The admin who enrolled it has used it, so their offline work on it can be pushed later.
    await store.noteDeviceUser(deviceId, user.id, atMs);
    await store.appendAudit(auditEntry({ kind: 'device.enrolled', serverTimeMs: atMs, unitId: user.unitId, userId: user.id, username: user.username, recordId: deviceId, deviceId: session.deviceId }));
    return { deviceId, deviceToken };
  });

  app.get('/api/devices', { config: { roles: adminOnly } }, async (request) => {
    const { user } = authOf(request);
    return { devices: (await store.listDevices(user.unitId)).map(deviceView) };
  });

  app.post('/api/devices/:id/revoke', { config: { roles: adminOnly } }, async (request, reply) => {
    const { user, device } = authOf(request);
    const { id } = parseInput(deviceIdSchema, request.params);
    const target = await store.getDevice(id);
    if (!target || target.unitId !== user.unitId) throw notFound('No tablet with that id on your unit.');
    const atMs = nowMs();
    await store.revokeDevice(id, atMs);
    await store.appendAudit(auditEntry({ kind: 'device.revoked', serverTimeMs: atMs, unitId: user.unitId, userId: user.id, username: user.username, recordId: id, deviceId: device?.id ?? null }));
    return reply.code(204).send();
  });
}
