import { randomUUID } from 'node:crypto';
import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { passwordSchema, personNameSchema, roleSchema, usernameSchema } from '../accounts/account-fields.ts';
import { publicUser } from '../accounts/public-user.ts';
import { auditEntry } from '../audit/audit-entry.ts';
import { authOf } from '../auth/access-guard.ts';
import { hashPassword } from '../auth/password-hash.ts';
import { HttpError, notFound } from '../http-error.ts';
import { parseInput } from '../parse-input.ts';
import type { Store, UserPatch } from '../storage/store.ts';

const objectOnly = { error: (issue: { code: string }) => (issue.code === 'invalid_type' ? 'body must be a JSON object' : undefined) };
const newUserSchema = z.strictObject({ username: usernameSchema, name: personNameSchema, role: roleSchema, password: passwordSchema }, objectOnly);
const userPatchSchema = z.strictObject({ name: personNameSchema.optional(), role: roleSchema.optional(), active: z.boolean({ error: 'active must be true or false' }).optional(), password: passwordSchema.optional() }, objectOnly);
const userIdSchema = z.strictObject({ id: z.string().min(1).max(64, 'id must be at most 64 characters') });

const adminOnly = ['unit-admin'] as const;

/** Account administration for unit admins: list, create, change, and end someone's sessions. */
export function registerUserRoutes(app: FastifyInstance, { store, nowMs, passwordLogN }: { store: Store; nowMs: () => number; passwordLogN?: number }): void {
  app.get('/api/users', { config: { roles: adminOnly } }, async (request) => {
    const { user } = authOf(request);
    return { users: (await store.listUsers(user.unitId)).map(publicUser) };
  });

  app.post('/api/users', { config: { roles: adminOnly } }, async (request) => {
    const { user: admin, device } = authOf(request);
    const body = parseInput(newUserSchema, request.body);
    const atMs = nowMs();
    const created = { id: randomUUID(), unitId: admin.unitId, username: body.username.toLowerCase(), name: body.name, role: body.role, passwordHash: await hashPassword(body.password, passwordLogN), active: true, createdAtMs: atMs };
    if (!(await store.createUser(created))) {
      throw new HttpError(409, { errors: [{ field: 'username', message: `username ${created.username} is already taken; choose another` }] });
    }
    await store.appendAudit(auditEntry({ kind: 'user.created', serverTimeMs: atMs, unitId: admin.unitId, userId: admin.id, username: admin.username, recordId: created.id, deviceId: device?.id ?? null, detail: `role ${created.role}` }));
    return publicUser(created);
  });

  app.patch('/api/users/:id', { config: { roles: adminOnly } }, async (request) => {
    const { user: admin, device } = authOf(request);
    const { id } = parseInput(userIdSchema, request.params);
    const body = parseInput(userPatchSchema, request.body);
    const target = await store.getUser(id);
    if (!target || target.unitId !== admin.unitId) throw notFound('No account with that id on your unit.');
    if (target.id === admin.id && (body.active === false || (body.role !== undefined && body.role !== 'unit-admin'))) {
      throw new HttpError(400, { errors: [{ field: body.active === false ? 'active' : 'role', message: 'You cannot remove your own unit admin access; ask another unit admin.' }] });
    }
    const patch: UserPatch = {};
    if (body.name !== undefined) patch.name = body.name;
    if (body.role !== undefined) patch.role = body.role;
    if (body.active !== undefined) patch.active = body.active;
    if (body.password !== undefined) patch.passwordHash = await hashPassword(body.password, passwordLogN);
    const atMs = nowMs();
    await store.updateUser(id, patch);
    // A deactivated account or a new password ends every open session of that person.
    if (body.active === false || body.password !== undefined) await store.endSessionsOfUser(id, atMs);
    const changed = Object.keys(body).sort().join(', ');
    await store.appendAudit(auditEntry({ kind: 'user.changed', serverTimeMs: atMs, unitId: admin.unitId, userId: admin.id, username: admin.username, recordId: id, deviceId: device?.id ?? null, detail: `changed: ${changed}${body.role ? `; role ${body.role}` : ''}` }));
    return publicUser((await store.getUser(id)) ?? target);
  });

  app.post('/api/users/:id/end-sessions', { config: { roles: adminOnly } }, async (request) => {
    const { user: admin, device } = authOf(request);
    const { id } = parseInput(userIdSchema, request.params);
    const target = await store.getUser(id);
    if (!target || target.unitId !== admin.unitId) throw notFound('No account with that id on your unit.');
    const atMs = nowMs();
    const ended = await store.endSessionsOfUser(id, atMs);
    await store.appendAudit(auditEntry({ kind: 'session.revoked', serverTimeMs: atMs, unitId: admin.unitId, userId: admin.id, username: admin.username, recordId: id, deviceId: device?.id ?? null, detail: `${ended} session(s) ended` }));
    return { ended };
  });
}
