import { describe, expect, it } from 'vitest';
import { currentDevice, currentSession, enrollDevice, signIn, signOut } from '../../src/sync/server-session.ts';
import { ManualClock, adminCy, connectionTo, newServer, newTablet, nurseAsh, t0 } from './sync-fixtures.ts';

async function setUp() {
  const server = await newServer();
  const clock = new ManualClock(t0);
  return { server, clock, db: await newTablet(), connection: connectionTo(server, clock) };
}

describe('server session', () => {
  it('keeps the session and the user after sign-in, never the password', async () => {
    const { db, connection } = await setUp();
    const answer = await signIn(db, connection, { username: ` ${nurseAsh.username} `, password: nurseAsh.password }, t0);
    const session = await currentSession(db);
    expect(session).toMatchObject({ token: answer.token, user: { id: nurseAsh.id, role: 'nurse' }, signedInAtMs: t0 });
    expect(JSON.stringify(await db.settings.toArray())).not.toContain(nurseAsh.password);
  });

  it('names the empty fields without calling the server', async () => {
    const { server, db, connection } = await setUp();
    await expect(signIn(db, connection, { username: ' ', password: '' }, t0)).rejects.toMatchObject({
      errors: [{ field: 'username' }, { field: 'password' }],
    });
    expect(server.requests).toBe(0);
  });

  it('passes on the server asking to wait after too many attempts (429)', async () => {
    const { db, connection } = await setUp();
    const limited = { ...connection, fetch: async () => ({ status: 429, json: async () => ({ error: 'too many' }) }) };
    await expect(signIn(db, limited, { username: 'ash', password: 'x' }, t0)).rejects.toThrow('Too many sign-in attempts: wait a few minutes, then try again.');
  });

  it('enrols the tablet under a unit admin and sends the device token at the next sign-in', async () => {
    const { db, connection } = await setUp();
    await signIn(db, connection, { username: adminCy.username, password: adminCy.password }, t0);
    await enrollDevice(db, connection, 'Tablet 4, bay D');
    expect(await currentDevice(db)).toEqual({ deviceId: 'device-1', deviceToken: 'device-token-1' });
    const sent: string[] = [];
    const watching = { ...connection, fetch: async (url: string, init: Parameters<typeof connection.fetch>[1]) => {
      sent.push(init.body ?? '');
      return connection.fetch(url, init);
    } };
    await signIn(db, watching, { username: nurseAsh.username, password: nurseAsh.password }, t0);
    expect(JSON.parse(sent[0]!)).toMatchObject({ deviceToken: 'device-token-1' });
  });

  it('refuses enrolment by a nurse (403) and keeps the tablet unenrolled', async () => {
    const { db, connection } = await setUp();
    await signIn(db, connection, { username: nurseAsh.username, password: nurseAsh.password }, t0);
    await expect(enrollDevice(db, connection, 'Tablet 5')).rejects.toMatchObject({ kind: 'not-allowed', status: 403 });
    expect(await currentDevice(db)).toBeNull();
  });

  it('refuses a tablet name shorter than 2 or longer than 60 characters', async () => {
    const { db, connection } = await setUp();
    await signIn(db, connection, { username: adminCy.username, password: adminCy.password }, t0);
    await expect(enrollDevice(db, connection, 'A')).rejects.toMatchObject({ errors: [{ field: 'label', min: 2, max: 60 }] });
    await expect(enrollDevice(db, connection, 'x'.repeat(61))).rejects.toMatchObject({ errors: [{ field: 'label' }] });
  });

  it('signs out on the server, and forgets the session even when the server cannot be reached', async () => {
    const { server, db, connection } = await setUp();
    await signIn(db, connection, { username: nurseAsh.username, password: nurseAsh.password }, t0);
    await signOut(db, connection);
    expect(server.sessions.size).toBe(0);
    expect(await currentSession(db)).toBeNull();
    await signIn(db, connection, { username: nurseAsh.username, password: nurseAsh.password }, t0);
    const offline = { ...connection, fetch: async () => { throw new TypeError('Failed to fetch'); } };
    await signOut(db, offline);
    expect(await currentSession(db)).toBeNull();
  });
});
