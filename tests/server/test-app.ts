import type { FastifyInstance, LightMyRequestResponse } from 'fastify';
import { createAccount, createUnit } from '../../src/server/accounts/unit-setup.ts';
import type { AppOptions } from '../../src/server/build-app.ts';
import { buildApp } from '../../src/server/build-app.ts';
import type { ServerSettings } from '../../src/server/settings.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import type { Role, Store, UserRecord } from '../../src/server/storage/store.ts';
import type { Unit } from '../../src/core/records.ts';
import { baseTimeMs } from './fixtures.ts';

/** Cheap scrypt for tests (2^10); production hashes use 2^15 (see password-hash.ts). */
export const testPasswordLogN = 10;
export const testPassword = 'a long test passphrase';

/** A signed-in clinician on an enrolled tablet, with request helpers that send both tokens. */
export interface Clinician {
  user: UserRecord;
  token: string;
  deviceToken: string;
  get(url: string): Promise<LightMyRequestResponse>;
  post(url: string, body?: unknown): Promise<LightMyRequestResponse>;
  patch(url: string, body?: unknown): Promise<LightMyRequestResponse>;
}

export interface TestApp {
  app: FastifyInstance;
  store: Store;
  unit: Unit;
  clock: { nowMs: number };
  admin: Clinician;
  /** The first enrolled tablet's token. */
  deviceToken: string;
  /** Creates an account through the API and signs it in on the given tablet (default: the first). */
  clinician(role: Role, options?: { username?: string; deviceToken?: string }): Promise<Clinician>;
  enrollDevice(label?: string): Promise<string>;
  close(): Promise<void>;
}

function clinicianOf(app: FastifyInstance, user: UserRecord, token: string, deviceToken: string): Clinician {
  const headers = { authorization: `Bearer ${token}`, 'x-device-token': deviceToken };
  return {
    user,
    token,
    deviceToken,
    get: (url) => app.inject({ method: 'GET', url, headers }),
    post: (url, body) => app.inject({ method: 'POST', url, headers, ...(body === undefined ? {} : { payload: body as object }) }),
    patch: (url, body) => app.inject({ method: 'PATCH', url, headers, payload: body as object }),
  };
}

export async function signIn(app: FastifyInstance, username: string, password: string, deviceToken?: string): Promise<LightMyRequestResponse> {
  return app.inject({ method: 'POST', url: '/api/auth/sign-in', payload: { username, password, ...(deviceToken ? { deviceToken } : {}) } });
}

/** A whole server in-process over a fresh store: a unit, its admin signed in on one enrolled tablet. */
export async function openTestApp(options: { store?: Store; settings?: Partial<ServerSettings>; log?: AppOptions['log']; adminUsername?: string } = {}): Promise<TestApp> {
  const store = options.store ?? (await openSqliteStore(':memory:'));
  const clock = { nowMs: baseTimeMs };
  const appOptions: AppOptions = { store, nowMs: () => clock.nowMs, passwordLogN: testPasswordLogN, settings: { distDir: '/nonexistent-dist', ...options.settings } };
  if (options.log) appOptions.log = options.log;
  const app = await buildApp(appOptions);
  const unit = await createUnit(store, { name: '4 West Telemetry', timeZone: 'Europe/Dublin', idleLockMinutes: 5 }, clock.nowMs);
  const adminUsername = options.adminUsername ?? 'admin';
  const adminUser = await createAccount(store, { unitId: unit.id, username: adminUsername, name: 'A. Admin', role: 'unit-admin', password: testPassword }, clock.nowMs, testPasswordLogN);

  const first = (await signIn(app, adminUsername, testPassword)).json() as { token: string };
  const enroll = async (label = 'Tablet A'): Promise<string> => {
    const answer = await app.inject({ method: 'POST', url: '/api/devices/enroll', headers: { authorization: `Bearer ${first.token}` }, payload: { label } });
    if (answer.statusCode !== 200) throw new Error(`enrolment failed: ${answer.body}`);
    return (answer.json() as { deviceToken: string }).deviceToken;
  };
  const deviceToken = await enroll();
  const adminSession = (await signIn(app, adminUsername, testPassword, deviceToken)).json() as { token: string };
  const admin = clinicianOf(app, adminUser, adminSession.token, deviceToken);
  let counter = 0;

  return {
    app,
    store,
    unit,
    clock,
    admin,
    deviceToken,
    enrollDevice: enroll,
    async clinician(role, extra = {}) {
      counter += 1;
      const username = extra.username ?? `${adminUsername}-${role}-${counter}`;
      const created = await admin.post('/api/users', { username, name: `Clinician ${counter}`, role, password: testPassword });
      if (created.statusCode !== 200) throw new Error(`account not created: ${created.body}`);
      const tablet = extra.deviceToken ?? deviceToken;
      const session = await signIn(app, username, testPassword, tablet);
      if (session.statusCode !== 200) throw new Error(`sign-in failed: ${session.body}`);
      const user = await store.findUserByUsername(username);
      if (!user) throw new Error('account missing');
      return clinicianOf(app, user, (session.json() as { token: string }).token, tablet);
    },
    async close() {
      await app.close();
      await store.close();
    },
  };
}
