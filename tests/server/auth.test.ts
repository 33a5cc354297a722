import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tokenHash } from '../../src/server/auth/opaque-token.ts';
import { hashPassword, verifyPassword } from '../../src/server/auth/password-hash.ts';
import type { TestApp } from './test-app.ts';
import { openTestApp, signIn, testPassword } from './test-app.ts';

const minuteMs = 60_000;
const hourMs = 3_600_000;

describe('passwords', () => {
  it('hashes with scrypt, a fresh salt each time, and never keeps the password', async () => {
    const first = await hashPassword('a long passphrase', 10);
    const second = await hashPassword('a long passphrase', 10);
    expect(first.split('$').slice(0, 4)).toEqual(['scrypt', '10', '8', '1']);
    expect(first).not.toBe(second);
    expect(first).not.toContain('passphrase');
    expect(await verifyPassword('a long passphrase', first)).toBe(true);
    expect(await verifyPassword('a long passphrasE', first)).toBe(false);
    expect(await verifyPassword('a long passphrase', 'md5$abc')).toBe(false);
  });

  it('uses 2^15 (32 MiB) by default', async () => {
    expect((await hashPassword('a long passphrase')).split('$')[1]).toBe('15');
  });
});

describe('sign-in, sessions and devices', () => {
  let t: TestApp;
  beforeEach(async () => {
    t = await openTestApp({ settings: { sessionIdleMinutes: 720, sessionMaxHours: 24, signInMaxFailures: 5, signInWindowMinutes: 15 } });
  });
  afterEach(async () => {
    await t.close();
  });

  it('signs in with a token, its expiry and the user without any credential hash', async () => {
    const answer = await signIn(t.app, 'ADMIN', testPassword, t.deviceToken);
    expect(answer.statusCode).toBe(200);
    const body = answer.json() as { token: string; expiresAtMs: number; user: Record<string, unknown> };
    expect(body.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(body.expiresAtMs).toBe(t.clock.nowMs + 24 * hourMs);
    expect(body.user).toEqual({ id: t.admin.user.id, name: 'A. Admin', username: 'admin', role: 'unit-admin', unitId: t.unit.id, active: true });
    expect(answer.body).not.toMatch(/scrypt|passwordHash/);
  });

  it('keeps only a SHA-256 of session and device tokens', async () => {
    const session = await t.store.findSessionByTokenHash(tokenHash(t.admin.token));
    expect(session?.userId).toBe(t.admin.user.id);
    expect(await t.store.findSessionByTokenHash(t.admin.token)).toBeUndefined();
    expect((await t.store.findDeviceByTokenHash(tokenHash(t.deviceToken)))?.label).toBe('Tablet A');
  });

  it('answers a wrong password and an unknown name with the same 401', async () => {
    const wrong = await signIn(t.app, 'admin', 'not the passphrase');
    const unknown = await signIn(t.app, 'nobody', 'not the passphrase');
    expect([wrong.statusCode, unknown.statusCode]).toEqual([401, 401]);
    expect(wrong.json()).toEqual(unknown.json());
  });

  it('refuses a sign-in body without a username, naming the field', async () => {
    const answer = await t.app.inject({ method: 'POST', url: '/api/auth/sign-in', payload: { password: 'x' } });
    expect(answer.statusCode).toBe(400);
    expect((answer.json() as { errors: Array<{ field: string }> }).errors.map((e) => e.field)).toEqual(['username']);
  });

  it('refuses the sixth attempt within 15 minutes (429), even with the right password, then allows it once the window passes', async () => {
    for (let i = 0; i < 5; i += 1) expect((await signIn(t.app, 'admin', `wrong guess ${i}`)).statusCode).toBe(401);
    t.clock.nowMs += 10 * minuteMs;
    const refused = await signIn(t.app, 'admin', testPassword);
    expect(refused.statusCode).toBe(429);
    expect(refused.headers['retry-after']).toBe(String(5 * 60));
    expect((refused.json() as { error: string }).error).toMatch(/Too many failed sign-ins/);
    t.clock.nowMs += 5 * minuteMs + 1000;
    expect((await signIn(t.app, 'admin', testPassword)).statusCode).toBe(200);
  });

  it('counts failures per username, so another clinician can still sign in', async () => {
    await t.clinician('nurse', { username: 'nurse-b' });
    for (let i = 0; i < 5; i += 1) await signIn(t.app, 'admin', `wrong guess ${i}`);
    expect((await signIn(t.app, 'admin', testPassword)).statusCode).toBe(429);
    expect((await signIn(t.app, 'nurse-b', testPassword)).statusCode).toBe(200);
  });

  it('ends the session on the server at sign-out', async () => {
    expect((await t.admin.get('/api/me')).statusCode).toBe(200);
    expect((await t.admin.post('/api/auth/sign-out')).statusCode).toBe(204);
    const after = await t.admin.get('/api/me');
    expect([after.statusCode, (after.json() as { code: string }).code]).toEqual([401, 'session-ended']);
  });

  it('ends a session left unused for the idle limit (12 h), but not one in use', async () => {
    t.clock.nowMs += 11 * hourMs;
    expect((await t.admin.get('/api/me')).statusCode).toBe(200);
    t.clock.nowMs += 11 * hourMs;
    expect((await t.admin.get('/api/me')).statusCode).toBe(200);
    t.clock.nowMs += 12 * hourMs;
    expect((await t.admin.get('/api/me')).statusCode).toBe(401);
  });

  it('ends a session 24 h after sign-in however busy it is', async () => {
    for (let h = 0; h < 23; h += 1) {
      t.clock.nowMs += hourMs;
      expect((await t.admin.get('/api/me')).statusCode).toBe(200);
    }
    t.clock.nowMs += hourMs;
    expect((await t.admin.get('/api/me')).statusCode).toBe(401);
  });

  it('lets a unit admin end all sessions of a clinician', async () => {
    const nurse = await t.clinician('nurse');
    const answer = await t.admin.post(`/api/users/${nurse.user.id}/end-sessions`);
    expect(answer.json()).toEqual({ ended: 1 });
    expect((await nurse.get('/api/me')).statusCode).toBe(401);
  });

  it('ends the sessions of a deactivated account and refuses its sign-in', async () => {
    const nurse = await t.clinician('nurse', { username: 'leaver' });
    expect((await t.admin.patch(`/api/users/${nurse.user.id}`, { active: false })).statusCode).toBe(200);
    expect((await nurse.get('/api/me')).statusCode).toBe(401);
    expect((await signIn(t.app, 'leaver', testPassword)).statusCode).toBe(401);
  });

  it('tells the tablet who is signed in on which enrolled device', async () => {
    const answer = await t.admin.get('/api/me');
    const body = answer.json() as { user: { username: string }; device: { label: string } };
    expect([body.user.username, body.device.label]).toEqual(['admin', 'Tablet A']);
  });

  it('lets only a unit admin enroll a tablet, and refuses a withdrawn one', async () => {
    const nurse = await t.clinician('nurse');
    const refused = await t.app.inject({ method: 'POST', url: '/api/devices/enroll', headers: { authorization: `Bearer ${nurse.token}` }, payload: { label: 'Mine' } });
    expect(refused.statusCode).toBe(403);
    const tabletB = await t.enrollDevice('Tablet B');
    const onB = await t.clinician('nurse', { deviceToken: tabletB });
    expect((await onB.get('/api/me')).statusCode).toBe(200);
    const device = await t.store.findDeviceByTokenHash(tokenHash(tabletB));
    expect((await t.admin.post(`/api/devices/${device?.id}/revoke`)).statusCode).toBe(204);
    expect((await onB.get('/api/me')).statusCode).toBe(403);
  });

  it('refuses a session started on one tablet when used from another', async () => {
    const tabletB = await t.enrollDevice('Tablet B');
    const answer = await t.app.inject({ method: 'GET', url: '/api/me', headers: { authorization: `Bearer ${t.admin.token}`, 'x-device-token': tabletB } });
    expect([answer.statusCode, (answer.json() as { code: string }).code]).toEqual([403, 'device-mismatch']);
  });

  it('refuses an enrolment without a label, naming the field', async () => {
    const answer = await t.admin.post('/api/devices/enroll', {});
    expect(answer.statusCode).toBe(400);
    expect(answer.json()).toEqual({ errors: [{ field: 'label', message: expect.stringMatching(/^label/) }] });
  });
});

describe('accounts', () => {
  let t: TestApp;
  beforeEach(async () => {
    t = await openTestApp();
  });
  afterEach(async () => {
    await t.close();
  });

  it('creates clinicians with a role and lists them without credential hashes', async () => {
    const created = await t.admin.post('/api/users', { username: 'C.Nurse', name: 'C. Nurse', role: 'charge-nurse', password: testPassword });
    expect(created.statusCode).toBe(200);
    expect(created.json()).toMatchObject({ username: 'c.nurse', role: 'charge-nurse', unitId: t.unit.id });
    const list = await t.admin.get('/api/users');
    expect((list.json() as { users: Array<{ username: string }> }).users.map((u) => u.username)).toEqual(['admin', 'c.nurse']);
    expect(list.body).not.toMatch(/scrypt|passwordHash|password/);
  });

  it('names every bad field of a new account and what is allowed', async () => {
    const answer = await t.admin.post('/api/users', { username: 'x', name: '', role: 'surgeon', password: 'short' });
    expect(answer.statusCode).toBe(400);
    const errors = (answer.json() as { errors: Array<{ field: string; message: string }> }).errors;
    expect(errors.map((e) => e.field).sort()).toEqual(['name', 'password', 'role', 'username']);
    expect(errors.find((e) => e.field === 'password')?.message).toBe('password must be 10 to 200 characters');
  });

  it('refuses a username already taken (409, naming username)', async () => {
    const answer = await t.admin.post('/api/users', { username: 'ADMIN', name: 'Second', role: 'nurse', password: testPassword });
    expect([answer.statusCode, (answer.json() as { errors: Array<{ field: string }> }).errors[0]?.field]).toEqual([409, 'username']);
  });

  it('refuses to let a unit admin remove their own admin access', async () => {
    const answer = await t.admin.patch(`/api/users/${t.admin.user.id}`, { role: 'nurse' });
    expect(answer.statusCode).toBe(400);
  });
});
