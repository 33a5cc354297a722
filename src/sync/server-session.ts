import { z } from 'zod';
import type { RhythmDb } from '../store/db.ts';
import type { CallCredentials, ServerConnection } from './server-call.ts';
import { callServer } from './server-call.ts';
import { SyncError } from './sync-error.ts';
import type { EnrollResponse, SignInResponse } from './sync-protocol.ts';
import { enrollResponseSchema, signInResponseSchema } from './sync-protocol.ts';
import type { StoredDevice, StoredSession } from './sync-settings.ts';
import { deviceKey, readSyncSetting, sessionKey, writeSyncSetting } from './sync-settings.ts';

/**
 * The server session this tablet holds, or null when there is none. Its expiry is the server's to
 * judge (a 401 ends it here): the tablet's clock may be hours off, and a wrong clock must never
 * stop a tablet from sending, nor keep it sending on a session the server has ended.
 */
export async function currentSession(db: RhythmDb): Promise<StoredSession | null> {
  return (await readSyncSetting<StoredSession>(db, sessionKey)) ?? null;
}

/** This tablet's enrolment, or null before a unit admin has enrolled it. */
export async function currentDevice(db: RhythmDb): Promise<StoredDevice | null> {
  return (await readSyncSetting<StoredDevice>(db, deviceKey)) ?? null;
}

/** The tokens for authenticated calls, or null when nobody is signed in online. */
export async function credentialsOf(db: RhythmDb): Promise<CallCredentials | null> {
  const session = await currentSession(db);
  if (!session) return null;
  const device = await currentDevice(db);
  return { sessionToken: session.token, deviceToken: device?.deviceToken ?? null };
}

/**
 * Signs in to the unit server and keeps the session on the tablet. Wrong credentials and too many
 * attempts come back as a SyncError whose message the sign-in form shows as it is; the password is
 * never stored.
 */
export async function signIn(db: RhythmDb, connection: ServerConnection, input: { username: string; password: string }, nowMs: number): Promise<SignInResponse> {
  const username = input.username.trim();
  const errors = [];
  if (username === '') errors.push({ field: 'username', message: 'username: type your unit server username.' });
  if (input.password === '') errors.push({ field: 'password', message: 'password: type your unit server password.' });
  if (errors.length > 0) throw new SyncError('refused', errors.map((e) => e.message).join(' '), { errors });
  const device = await currentDevice(db);
  let answer: SignInResponse;
  try {
    answer = await callServer(connection, {
      method: 'POST',
      path: '/api/auth/sign-in',
      body: { username, password: input.password, ...(device ? { deviceToken: device.deviceToken } : {}) },
      schema: signInResponseSchema,
    });
  } catch (error) {
    if (error instanceof SyncError && error.status === 401) throw new SyncError('refused', 'That username and password were not recognised by the unit server.', { status: 401 });
    if (error instanceof SyncError && error.status === 429) throw new SyncError('rate-limited', 'Too many sign-in attempts: wait a few minutes, then try again.', { status: 429 });
    throw error;
  }
  await writeSyncSetting(db, sessionKey, { token: answer.token, expiresAtMs: answer.expiresAtMs, user: answer.user, signedInAtMs: nowMs } satisfies StoredSession);
  return answer;
}

/**
 * Whether the unit server still knows this tablet's enrolment, asked with the session just opened.
 * A tablet keeps its device token for good, but the server may have lost it (restored from a
 * backup taken before the enrolment) or a unit admin may have withdrawn it: then it must be
 * enrolled again. Only the server's own "not enrolled" answer says no; offline or any other
 * failure keeps the enrolment the tablet holds.
 */
export async function enrolmentStillKnown(db: RhythmDb, connection: ServerConnection): Promise<boolean> {
  const credentials = await credentialsOf(db);
  if (!credentials?.deviceToken) return false;
  try {
    await callServer(connection, { method: 'GET', path: '/api/me', credentials, schema: z.unknown() });
    return true;
  } catch (error) {
    return !(error instanceof SyncError && error.status === 403 && error.code === 'device-not-enrolled');
  }
}

/** Enrols this tablet with the unit (a unit admin's session is needed) and keeps its device token. */
export async function enrollDevice(db: RhythmDb, connection: ServerConnection, label: string): Promise<EnrollResponse> {
  const trimmed = label.trim();
  if (trimmed.length < 2 || trimmed.length > 60) {
    throw new SyncError('refused', 'label: name the tablet so the unit admin can tell it apart (2 to 60 characters).', { errors: [{ field: 'label', message: 'label: 2 to 60 characters', min: 2, max: 60 }] });
  }
  const credentials = await credentialsOf(db);
  if (!credentials) throw new SyncError('signed-out', 'Sign in to the unit server as a unit admin to enrol this tablet.');
  const answer = await callServer(connection, { method: 'POST', path: '/api/devices/enroll', body: { label: trimmed }, credentials, schema: enrollResponseSchema });
  await writeSyncSetting(db, deviceKey, { deviceId: answer.deviceId, deviceToken: answer.deviceToken } satisfies StoredDevice);
  return answer;
}

/**
 * Ends the server session. The tablet forgets its token even when the server cannot be reached
 * (the token then simply expires there); the device enrolment and every record stay.
 */
export async function signOut(db: RhythmDb, connection: ServerConnection): Promise<void> {
  const credentials = await credentialsOf(db);
  await writeSyncSetting(db, sessionKey, undefined);
  if (!credentials) return;
  try {
    await callServer(connection, { method: 'POST', path: '/api/auth/sign-out', credentials, schema: z.unknown(), emptyStatus: 204 });
  } catch {
    // Offline or already expired: the local session is gone either way, which is what signing out means here.
  }
}

/** Forgets the session after the server said it has ended (401), keeping who it was for the sign-in form. */
export async function dropSession(db: RhythmDb): Promise<void> {
  await writeSyncSetting(db, sessionKey, undefined);
}
