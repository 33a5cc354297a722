// @vitest-environment node
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FastifyInstance } from 'fastify';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Bed, Stay, Unit } from '../../src/core/records.ts';
import { createAccount, createUnit } from '../../src/server/accounts/unit-setup.ts';
import { buildApp } from '../../src/server/build-app.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import type { Store, UserRecord } from '../../src/server/storage/store.ts';
import { verifyPin } from '../../src/store/clinicians.ts';
import { RhythmDb } from '../../src/store/db.ts';
import { readSetting } from '../../src/store/settings.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { admitStay } from '../../src/store/stays.ts';
import { saveBed } from '../../src/store/unit-setup.ts';
import type { ServerConnection, SyncFetch } from '../../src/sync/server-call.ts';
import { saveServerAccount } from '../../src/sync/server-accounts.ts';
import { enrollDevice, signIn } from '../../src/sync/server-session.ts';
import type { SyncEngine } from '../../src/sync/sync-engine.ts';
import { createSyncEngine } from '../../src/sync/sync-engine.ts';
import { counts } from './sync-fixtures.ts';

// The tablet's sync engine against the real unit server, in-process (requests injected, no
// socket), over a SQLite file in a temporary folder. Invented unit, staff and patient.

const hourMs = 3_600_000;
const serverStartMs = Date.UTC(2026, 5, 2, 7, 0);
const password = 'an invented long passphrase';
const pinIterations = 1_000;

/** The Fastify app as the engine's fetch: each call becomes an injected request. */
function injectFetch(app: FastifyInstance, faults: { loseNextPushAnswer: boolean }): SyncFetch {
  return async (url, init) => {
    const { pathname, search } = new URL(url);
    const answer = await app.inject({ method: init.method as 'GET' | 'POST', url: `${pathname}${search}`, headers: init.headers, ...(init.body === undefined ? {} : { payload: init.body }) });
    if (pathname === '/api/sync/push' && faults.loseNextPushAnswer) {
      // The server has committed the push; its answer never reaches the tablet.
      faults.loseNextPushAnswer = false;
      throw new TypeError('Failed to fetch');
    }
    return { status: answer.statusCode, json: async () => answer.json() };
  };
}

interface Tablet {
  db: RhythmDb;
  engine: SyncEngine;
  connection: ServerConnection;
  clock: { offsetMs: number };
}

describe('sync engine against the real unit server (SQLite)', () => {
  let folder: string;
  let store: Store;
  let app: FastifyInstance;
  let unit: Unit;
  let admin: UserRecord;
  let ash: UserRecord;
  let bay: UserRecord;
  const serverClock = { nowMs: serverStartMs };
  const faults = { loseNextPushAnswer: false };

  beforeEach(async () => {
    folder = mkdtempSync(join(tmpdir(), 'rhythm-sync-'));
    serverClock.nowMs = serverStartMs;
    store = await openSqliteStore(join(folder, 'unit.sqlite'));
    app = await buildApp({ store, nowMs: () => serverClock.nowMs, passwordLogN: 10, settings: { distDir: join(folder, 'no-app') } });
    unit = await createUnit(store, { name: 'Invented Ward 6 North', timeZone: 'Europe/London', idleLockMinutes: 5 }, serverClock.nowMs);
    admin = await createAccount(store, { unitId: unit.id, username: 'cy', name: 'Cy Invented', role: 'unit-admin', password }, serverClock.nowMs, 10);
    ash = await createAccount(store, { unitId: unit.id, username: 'ash', name: 'Ash Invented', role: 'nurse', password }, serverClock.nowMs, 10);
    bay = await createAccount(store, { unitId: unit.id, username: 'bay', name: 'Bay Invented', role: 'nurse', password }, serverClock.nowMs, 10);
  });

  afterEach(async () => {
    await app.close();
    await store.close();
    rmSync(folder, { recursive: true, force: true });
  });

  /** A new tablet whose clock runs `offsetMs` from the server's. */
  function newTablet(offsetMs = 0): Tablet {
    const db = new RhythmDb(`sync-real-${Math.random().toString(36).slice(2)}`);
    const clock = { offsetMs };
    const fetch = injectFetch(app, faults);
    const connection: ServerConnection = { fetch, baseUrl: 'http://unit.invalid', setTimeout: (run, ms) => setTimeout(run, ms), clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>), requestTimeoutMs: 30_000 };
    const engine = createSyncEngine({ db, fetch, baseUrl: 'http://unit.invalid', now: () => serverClock.nowMs + clock.offsetMs, random: () => 0.5, setTimeout: connection.setTimeout, clearTimeout: connection.clearTimeout, events: null, isOnline: () => true, watchOutbox: false });
    return { db, engine, connection, clock };
  }

  const nowOn = (tablet: Tablet) => serverClock.nowMs + tablet.clock.offsetMs;

  /** A unit admin enrols the tablet, then the clinician signs in on it online and picks a PIN. */
  async function enrolAndSignIn(tablet: Tablet, user: UserRecord, label: string): Promise<void> {
    await signIn(tablet.db, tablet.connection, { username: 'cy', password }, nowOn(tablet));
    await enrollDevice(tablet.db, tablet.connection, label);
    await signInAs(tablet, user);
  }

  async function signInAs(tablet: Tablet, user: UserRecord): Promise<void> {
    const answer = await signIn(tablet.db, tablet.connection, { username: user.username, password }, nowOn(tablet));
    await saveServerAccount(tablet.db, { user: answer.user, pin: '2468', iterations: pinIterations }, nowOn(tablet));
    await tablet.engine.refresh();
  }

  async function serverReadCount(): Promise<number> {
    return (await store.pullChanges(unit.id, 0, 10_000)).filter((c) => c.kind === 'read.sign').length;
  }

  async function syncOk(tablet: Tablet) {
    const result = await tablet.engine.syncNow();
    if (!result.ok) throw result.error;
    return result;
  }

  async function setUpBedAndStay(tablet: Tablet): Promise<{ bed: Bed; stay: Stay }> {
    const bed: Bed = { id: 'bed-6n-000001', unitId: unit.id, label: 'Bed 1', sortOrder: 0, active: true };
    const atMs = nowOn(tablet);
    const stay: Stay = { id: 'stay-6n-000001', unitId: unit.id, bedId: bed.id, alias: 'R.T.', sex: 'female', paced: false, bundleBranchBlock: false, qtProlongingDrugs: '', notes: '', startMs: atMs - hourMs, endMs: null, updatedAtMs: atMs, updatedBy: 'Cy Invented' };
    await saveBed(tablet.db, bed, atMs);
    await admitStay(tablet.db, stay, atMs);
    return { bed, stay };
  }

  async function signReads(tablet: Tablet, stay: Stay, author: UserRecord, howMany: number): Promise<void> {
    for (let i = 0; i < howMany; i += 1) {
      serverClock.nowMs += 10 * 60_000;
      const atMs = nowOn(tablet);
      await signRead(tablet.db, { unit, stay, stripTimeMs: atMs - 60_000, counts, reason: 'routine', author: { id: author.id, name: author.name }, deviceId: 'tablet', enteredAtMs: atMs - 120_000, nowMs: atMs });
    }
  }

  it('two tablets on one bed, one clock 6 h slow, a lost answer and an ended session: 5 reads on the server and on each tablet', async () => {
    const wardTablet = newTablet();
    await enrolAndSignIn(wardTablet, admin, 'Tablet 1, bay A');
    // The admin's first sync pulls the unit the server created.
    expect((await syncOk(wardTablet)).pulled.received).toBe(1);
    expect((await wardTablet.db.units.get(unit.id))?.name).toBe('Invented Ward 6 North');
    expect(await readSetting(wardTablet.db, 'currentUnitId', null)).toBe(unit.id);
    const { stay } = await setUpBedAndStay(wardTablet);
    expect((await syncOk(wardTablet)).pushed).toMatchObject({ accepted: 2, rejected: 0 });

    // Ash signs in on the ward tablet and charts 3 reads; the answer to the push is lost once.
    await signInAs(wardTablet, ash);
    await signReads(wardTablet, stay, ash, 3);
    faults.loseNextPushAnswer = true;
    expect((await wardTablet.engine.syncNow()).ok).toBe(false);
    expect(await serverReadCount()).toBe(3);
    expect(wardTablet.engine.getState().pendingCount).toBe(3);
    await syncOk(wardTablet);
    expect(await serverReadCount()).toBe(3);
    expect(wardTablet.engine.getState()).toMatchObject({ pendingCount: 0, rejectedCount: 0 });

    // A second tablet, its clock 6 h slow, on the same bed.
    const slowTablet = newTablet(-6 * hourMs);
    await enrolAndSignIn(slowTablet, bay, 'Tablet 2, bay A');
    const firstPull = await syncOk(slowTablet);
    expect(firstPull.pulled.readsAdded).toBe(3);
    const pulledRead = (await slowTablet.db.reads.toArray())[0];
    // The server's figures came with the pull: 20 small boxes at 25 mm/s is 75 bpm (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology, 1500 rule).
    expect(pulledRead?.analysis?.rate.rateBpm).toBe(75);
    expect(pulledRead?.syncStatus).toBe('accepted');
    await signReads(slowTablet, stay, bay, 2);
    await syncOk(slowTablet);
    await syncOk(wardTablet);

    expect(await serverReadCount()).toBe(5);
    for (const tablet of [wardTablet, slowTablet]) {
      expect(await tablet.db.reads.count()).toBe(5);
      expect(await tablet.db.reads.where('syncStatus').equals('accepted').count()).toBe(5);
    }
    // Server order is arrival order: the slow tablet's reads come last though their device times are 6 h earlier.
    const readLog = (await store.pullChanges(unit.id, 0, 10_000)).filter((c) => c.kind === 'read.sign');
    expect(readLog.map((c) => c.deviceTimeMs < serverStartMs)).toEqual([false, false, false, true, true]);

    // The session ends on the server (its idle limit passes); nothing is lost and everything waits.
    serverClock.nowMs += 13 * hourMs;
    await signReads(wardTablet, stay, ash, 1);
    const refused = await wardTablet.engine.syncNow();
    expect(refused.ok).toBe(false);
    expect(wardTablet.engine.getState()).toMatchObject({ signedIn: false, pendingCount: 1, lastErrorKind: 'signed-out' });
    expect(await serverReadCount()).toBe(5);
    await signInAs(wardTablet, ash);
    await syncOk(wardTablet);
    // The slow tablet's session passed the same idle limit: Bay signs in again there too.
    expect(await slowTablet.engine.syncNow()).toMatchObject({ ok: false, error: { kind: 'signed-out' } });
    await signInAs(slowTablet, bay);
    await syncOk(slowTablet);
    expect(await serverReadCount()).toBe(6);
    expect(await wardTablet.db.reads.count()).toBe(6);
    expect(await slowTablet.db.reads.count()).toBe(6);
  }, 60_000);

  it('refuses a read the server will not take, and the tablet keeps it with the reason', async () => {
    const tablet = newTablet();
    await enrolAndSignIn(tablet, admin, 'Tablet 1, bay A');
    await syncOk(tablet);
    const { stay } = await setUpBedAndStay(tablet);
    await syncOk(tablet);
    await signInAs(tablet, ash);
    // Read on the tablet under Bay's name, who has no account on this unit by that id.
    await signReads(tablet, stay, { ...bay, id: 'user-not-on-this-unit' }, 1);
    await syncOk(tablet);
    const read = (await tablet.db.reads.toArray())[0];
    expect(read?.syncStatus).toBe('rejected');
    expect(read?.rejectReason).toBe('The clinician named on this change is not an active account on this unit.');
    expect(tablet.engine.getState()).toMatchObject({ rejectedCount: 1, rejectedReadCount: 1, pendingCount: 0 });
    expect(await serverReadCount()).toBe(0);
  });

  it('holds back, then sends, a read charted offline by a nurse who has not yet signed in online on that tablet', async () => {
    const tablet = newTablet();
    await enrolAndSignIn(tablet, admin, 'Tablet 1, bay A');
    await syncOk(tablet);
    const { stay } = await setUpBedAndStay(tablet);
    await syncOk(tablet);
    await signReads(tablet, stay, bay, 1);
    const first = await syncOk(tablet);
    expect(first.pushed).toMatchObject({ deferred: 1, accepted: 0, rejected: 0 });
    expect(tablet.engine.getState()).toMatchObject({ lastErrorKind: 'not-yet', pendingCount: 1 });
    expect((await tablet.db.reads.toArray())[0]?.rejectReason).toMatch(/Bay Invented, who has not signed in online on this tablet/);
    await signInAs(tablet, bay);
    await syncOk(tablet);
    expect(await serverReadCount()).toBe(1);
    expect((await tablet.db.reads.toArray())[0]).toMatchObject({ syncStatus: 'accepted' });
  });

  it('lets a clinician who signed in online unlock the tablet offline with the PIN chosen there', async () => {
    const tablet = newTablet();
    await enrolAndSignIn(tablet, admin, 'Tablet 1, bay A');
    const answer = await signIn(tablet.db, tablet.connection, { username: 'ash', password }, nowOn(tablet));
    await saveServerAccount(tablet.db, { user: answer.user, pin: '7315', pinRepeat: '7315', iterations: pinIterations }, nowOn(tablet));
    // Offline now: the PIN is checked on the tablet, against the server account's id and role.
    expect(await verifyPin(tablet.db, ash.id, '7315')).toMatchObject({ id: ash.id, role: 'nurse', name: 'Ash Invented' });
    expect(await verifyPin(tablet.db, ash.id, '7316')).toBeNull();
    await expect(signIn(tablet.db, tablet.connection, { username: 'ash', password: 'wrong words entirely' }, nowOn(tablet))).rejects.toThrow('That username and password were not recognised by the unit server.');
  });
});
