import { randomUUID } from 'node:crypto';
import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { publicUser } from '../accounts/public-user.ts';
import { auditEntry } from '../audit/audit-entry.ts';
import { authOf } from '../auth/access-guard.ts';
import { newOpaqueToken, tokenHash } from '../auth/opaque-token.ts';
import { unmatchableHash, verifyPassword } from '../auth/password-hash.ts';
import type { SignInLimit } from '../auth/sign-in-limit.ts';
import { signInAttemptKey, signInRetryAfterS } from '../auth/sign-in-limit.ts';
import { HttpError } from '../http-error.ts';
import { parseInput } from '../parse-input.ts';
import type { Store } from '../storage/store.ts';

const signInBodySchema = z.strictObject(
  {
    username: z.string({ error: 'username must be text' }).trim().min(1, 'username is required').max(40, 'username must be at most 40 characters'),
    password: z.string({ error: 'password must be text' }).min(1, 'password is required').max(200, 'password must be at most 200 characters'),
    deviceToken: z.string({ error: 'deviceToken must be text' }).max(200, 'deviceToken must be at most 200 characters').optional(),
  },
  { error: (issue) => (issue.code === 'invalid_type' ? 'body must be an object with username and password' : undefined) },
);

export interface AuthRouteOptions {
  store: Store;
  nowMs: () => number;
  sessionMaxMs: number;
  signInLimit: SignInLimit;
}

const wrongCredentials = 'That username and password do not match an active account.';

/** Sign-in (opens a session), sign-out (ends it on the server) and who-am-I. */
export function registerAuthRoutes(app: FastifyInstance, { store, nowMs, sessionMaxMs, signInLimit }: AuthRouteOptions): void {
  app.post('/api/auth/sign-in', { config: { access: 'public' } }, async (request) => {
    const body = parseInput(signInBodySchema, request.body);
    const atMs = nowMs();
    const attemptKey = signInAttemptKey(body.username, request.ip);
    const user = await store.findUserByUsername(body.username);
    const device = body.deviceToken ? await store.findDeviceByTokenHash(tokenHash(body.deviceToken)) : undefined;
    const usableDevice = device && device.revokedAtMs === null && user && device.unitId === user.unitId ? device : undefined;
    const base = { serverTimeMs: atMs, unitId: user?.unitId ?? null, userId: user?.id ?? null, username: body.username.toLowerCase(), deviceId: usableDevice?.id ?? null };

    const retryAfterS = await signInRetryAfterS(store, attemptKey, signInLimit, atMs);
    if (retryAfterS > 0) {
      await store.appendAudit(auditEntry({ ...base, kind: 'sign-in.refused', detail: 'too many failed attempts' }));
      throw new HttpError(
        429,
        { error: `Too many failed sign-ins for this name from this address. Try again in ${Math.ceil(retryAfterS / 60)} min, or ask a unit admin.`, retryAfterS },
        { 'retry-after': String(retryAfterS) },
      );
    }
    const matches = await verifyPassword(body.password, user?.passwordHash ?? unmatchableHash);
    if (!user || !user.active || !matches) {
      await store.recordSignInFailure(attemptKey, atMs);
      await store.appendAudit(auditEntry({ ...base, kind: 'sign-in.failed', detail: !user ? 'unknown username' : !user.active ? 'inactive account' : 'wrong password' }));
      throw new HttpError(401, { error: wrongCredentials, code: 'wrong-credentials' });
    }

    await store.clearSignInFailures(attemptKey);
    const token = newOpaqueToken();
    const expiresAtMs = atMs + sessionMaxMs;
    await store.createSession({ id: randomUUID(), tokenHash: tokenHash(token), userId: user.id, deviceId: usableDevice?.id ?? null, createdAtMs: atMs, lastSeenAtMs: atMs, expiresAtMs, endedAtMs: null });
    if (usableDevice) await store.noteDeviceUser(usableDevice.id, user.id, atMs);
    await store.appendAudit(auditEntry({ ...base, kind: 'sign-in.succeeded', detail: usableDevice ? null : 'device not enrolled' }));
    return { token, expiresAtMs, user: publicUser(user) };
  });

  app.post('/api/auth/sign-out', { config: { access: 'session' } }, async (request, reply) => {
    const { session, user } = authOf(request);
    const atMs = nowMs();
    await store.endSession(session.id, atMs);
    await store.appendAudit(auditEntry({ kind: 'sign-out', serverTimeMs: atMs, unitId: user.unitId, userId: user.id, username: user.username, deviceId: session.deviceId }));
    return reply.code(204).send();
  });

  app.get('/api/me', async (request) => {
    const { user, device } = authOf(request);
    return { user: publicUser(user), device: device && { id: device.id, label: device.label, enrolledAtMs: device.enrolledAtMs } };
  });
}
