import type { FastifyInstance, FastifyRequest } from 'fastify';
import { notAllowed, notSignedIn } from '../http-error.ts';
import type { DeviceRecord, Role, SessionRecord, Store, UserRecord } from '../storage/store.ts';
import { tokenHash } from './opaque-token.ts';

/**
 * Who may call a route: 'public' (health, sign-in), 'session' (a signed-in user, any device:
 * sign-out and device enrolment) or 'device' (a signed-in user on an enrolled tablet of their unit: everything else).
 */
export type Access = 'public' | 'session' | 'device';

/** The signed-in user, their session and (for 'device' routes) the enrolled tablet they use. */
export interface AuthContext {
  user: UserRecord;
  session: SessionRecord;
  device: DeviceRecord | null;
}

declare module 'fastify' {
  interface FastifyContextConfig {
    access?: Access;
    roles?: readonly Role[];
  }
  interface FastifyRequest {
    auth: AuthContext | null;
  }
}

export interface SessionLimits {
  idleMs: number;
  nowMs: () => number;
}

/** Last-seen times are written at most once a minute per session: enough for a 12 h idle limit, light on the database. */
const touchEveryMs = 60_000;

/** The signed-in context of a request that passed the guard; routes behind the guard call this. */
export function authOf(request: FastifyRequest): AuthContext {
  if (!request.auth) throw notSignedIn('Sign in first.');
  return request.auth;
}

function bearerToken(request: FastifyRequest): string | undefined {
  const header = request.headers.authorization;
  if (typeof header !== 'string') return undefined;
  const match = /^Bearer\s+([A-Za-z0-9_-]{20,200})$/.exec(header.trim());
  return match?.[1];
}

/** Refuses every request that lacks what its route's `access` and `roles` ask for, before the body is read. */
export function installAccessGuard(app: FastifyInstance, store: Store, limits: SessionLimits): void {
  app.decorateRequest('auth', null);
  app.addHook('onRequest', async (request) => {
    const config = request.routeOptions.config;
    const access: Access = config.access ?? 'device';
    if (!request.routeOptions.url?.startsWith('/api/') || access === 'public') return;

    const token = bearerToken(request);
    if (!token) throw notSignedIn('Sign in first: this needs a session (Authorization: Bearer <token>).');
    const session = await store.findSessionByTokenHash(tokenHash(token));
    const nowMs = limits.nowMs();
    if (!session || session.endedAtMs !== null || nowMs >= session.expiresAtMs || nowMs - session.lastSeenAtMs >= limits.idleMs) {
      throw notSignedIn('Your session has ended; sign in again. Work on the tablet is kept.', 'session-ended');
    }
    const user = await store.getUser(session.userId);
    if (!user || !user.active) throw notSignedIn('This account is no longer active; ask a unit admin.', 'account-inactive');

    let device: DeviceRecord | null = null;
    if (access === 'device') {
      const deviceToken = request.headers['x-device-token'];
      const found = typeof deviceToken === 'string' && deviceToken.length > 0 && deviceToken.length <= 200 ? await store.findDeviceByTokenHash(tokenHash(deviceToken)) : undefined;
      if (!found || found.revokedAtMs !== null || found.unitId !== user.unitId) {
        throw notAllowed('This tablet is not enrolled on your unit (or was withdrawn); ask a unit admin to enroll it.', 'device-not-enrolled');
      }
      if (session.deviceId !== null && session.deviceId !== found.id) {
        throw notAllowed('This session was started on another tablet; sign in on this one.', 'device-mismatch');
      }
      device = found;
    }
    if (config.roles && !config.roles.includes(user.role)) {
      throw notAllowed(`Only ${config.roles.map((r) => r.replace('-', ' ')).join(' or ')} accounts can do this.`, 'role');
    }
    if (nowMs - session.lastSeenAtMs >= touchEveryMs) await store.touchSession(session.id, nowMs);
    request.auth = { user, session, device };
  });
}
