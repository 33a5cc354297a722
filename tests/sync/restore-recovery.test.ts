// @vitest-environment node
import { copyFileSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FastifyInstance } from 'fastify';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Bed, Stay, Unit } from '../../src/core/records.ts';
import { createAccount, createUnit } from '../../src/server/accounts/unit-setup.ts';
import { buildApp } from '../../src/server/build-app.ts';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import type { Store, UserRecord } from '../../src/server/storage/store.ts';
import { RhythmDb } from '../../src/store/db.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { admitStay, updateStay } from '../../src/store/stays.ts';
import { saveBed } from '../../src/store/unit-setup.ts';
import { beginRecovery, pullAndSortAfterRestore, resendReason } from '../../src/sync/recover-after-restore.ts';
import type { ServerConnection, SyncFetch } from '../../src/sync/server-call.ts';
import { saveServerAccount } from '../../src/sync/server-accounts.ts';
import { credentialsOf, enrollDevice, enrolmentStillKnown, signIn } from '../../src/sync/server-session.ts';
import type { SyncEngine } from '../../src/sync/sync-engine.ts';
import { createSyncEngine } from '../../src/sync/sync-engine.ts';
import type { RestoreRecovery } from '../../src/sync/sync-settings.ts';
import { readSyncSetting, restoreRecoveryKey } from '../../src/sync/sync-settings.ts';
import { syncStatusText } from '../../src/sync/sync-status-text.ts';
import { counts } from './sync-fixtures.ts';

// A unit server restored from a backup, against the real server in-process over a SQLite file:
// the backup is a copy of the file taken with the server stopped, the restore puts it back.
// Invented unit, staff and patient.

const hourMs = 3_600_000;
const startMs = Date.UTC(2026, 6, 14, 8, 0);
const password = 'an invented long passphrase';

interface Tablet {
  db: RhythmDb;
  engine: SyncEngine;
  connection: ServerConnection;
}

describe('a tablet after the unit server was restored from a backup (SQLite)', () => {
  let folder: string;
  let dbFile: string;
  let store: Store;
  let app: FastifyInstance;
  let unit: Unit;
  let admin: UserRecord;
  let ash: UserRecord;
  let bay: UserRecord;
  const clock = { nowMs: startMs };
  const network = { failPullsAfter: Number.POSITIVE_INFINITY, pulls: 0 };

  async function open(): Promise<void> {
    store = await openSqliteStore(dbFile);
    app = await buildApp({ store, nowMs: () => clock.nowMs, passwordLogN: 10, settings: { distDir: join(folder, 'no-app') } });
  }

  async function stop(): Promise<void> {
    await app.close();
    await store.close();
  }

  /** Stops the server, copies its database file aside, starts it again. */
  async function backUp(name: string): Promise<void> {
    await stop();
    expect(existsSync(`${dbFile}-wal`) && existsSync(`${dbFile}-shm`)).toBe(false);
    copyFileSync(dbFile, join(folder, name));
    await open();
  }

  /** Stops the server, puts the backup in place of its database, starts it again. */
  async function restore(name: string): Promise<void> {
    await stop();
    for (const extra of [`${dbFile}-wal`, `${dbFile}-shm`]) rmSync(extra, { force: true });
    copyFileSync(join(folder, name), dbFile);
    await open();
  }

  beforeEach(async () => {
    folder = mkdtempSync(join(tmpdir(), 'rhythm-restore-'));
    dbFile = join(folder, 'unit.sqlite');
    clock.nowMs = startMs;
    network.failPullsAfter = Number.POSITIVE_INFINITY;
    network.pulls = 0;
    await open();
    unit = await createUnit(store, { name: 'Invented Ward 3 West', timeZone: 'Europe/London', idleLockMinutes: 5 }, clock.nowMs);
    admin = await createAccount(store, { unitId: unit.id, username: 'cy', name: 'Cy Invented', role: 'unit-admin', password }, clock.nowMs, 10);
    ash = await createAccount(store, { unitId: unit.id, username: 'ash', name: 'Ash Invented', role: 'nurse', password }, clock.nowMs, 10);
    bay = await createAccount(store, { unitId: unit.id, username: 'bay', name: 'Bay Invented', role: 'charge-nurse', password }, clock.nowMs, 10);
  });

  afterEach(async () => {
    await stop();
    rmSync(folder, { recursive: true, force: true });
  });

  function newTablet(): Tablet {
    const db = new RhythmDb(`restore-${Math.random().toString(36).slice(2)}`);
    const fetch: SyncFetch = async (url, init) => {
      const { pathname, search } = new URL(url);
      if (pathname === '/api/sync/pull') {
        network.pulls += 1;
        if (network.pulls > network.failPullsAfter) throw new TypeError('Failed to fetch');
      }
      const answer = await app.inject({ method: init.method as 'GET' | 'POST', url: `${pathname}${search}`, headers: init.headers, ...(init.body === undefined ? {} : { payload: init.body }) });
      return { status: answer.statusCode, json: async () => answer.json() };
    };
    const connection: ServerConnection = { fetch, baseUrl: 'http://unit.invalid', setTimeout: (run, ms) => setTimeout(run, ms), clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>), requestTimeoutMs: 30_000 };
    const engine = createSyncEngine({ db, fetch, baseUrl: 'http://unit.invalid', now: () => clock.nowMs, random: () => 0.5, setTimeout: connection.setTimeout, clearTimeout: connection.clearTimeout, events: null, isOnline: () => true, watchOutbox: false });
    return { db, engine, connection };
  }

  async function enrolAndSignIn(tablet: Tablet, user: UserRecord, label: string): Promise<void> {
    await signIn(tablet.db, tablet.connection, { username: 'cy', password }, clock.nowMs);
    await enrollDevice(tablet.db, tablet.connection, label);
    await signInAs(tablet, user);
  }

  async function signInAs(tablet: Tablet, user: UserRecord): Promise<void> {
    const answer = await signIn(tablet.db, tablet.connection, { username: user.username, password }, clock.nowMs);
    await saveServerAccount(tablet.db, { user: answer.user, pin: '2468', iterations: 1_000 }, clock.nowMs);
    await tablet.engine.refresh();
  }

  async function syncOk(tablet: Tablet) {
    const result = await tablet.engine.syncNow();
    if (!result.ok) throw result.error;
    return result;
  }

  const bed = (): Bed => ({ id: 'bed-3w-000001', unitId: unit.id, label: 'Bed 4', sortOrder: 0, active: true });
  const stayOn = (b: Bed): Stay => ({ id: 'stay-3w-000001', unitId: unit.id, bedId: b.id, alias: 'J.N.', sex: 'male', paced: false, bundleBranchBlock: false, qtProlongingDrugs: '', notes: '', startMs: clock.nowMs - hourMs, endMs: null, updatedAtMs: clock.nowMs, updatedBy: 'Cy Invented' });

  async function signReads(tablet: Tablet, stay: Stay, author: UserRecord, howMany: number): Promise<void> {
    for (let i = 0; i < howMany; i += 1) {
      clock.nowMs += 10 * 60_000;
      await signRead(tablet.db, { unit, stay, stripTimeMs: clock.nowMs - 60_000, counts, reason: 'routine', author: { id: author.id, name: author.name }, deviceId: 'tablet', enteredAtMs: clock.nowMs - 120_000, nowMs: clock.nowMs });
    }
  }

  /** A ward tablet enrolled by the admin, its bed and patient synced, with nurse Ash signed in on it. */
  async function wardWithAdmittedStay(): Promise<{ ward: Tablet; stay: Stay }> {
    const ward = newTablet();
    await enrolAndSignIn(ward, admin, 'Tablet 1, bay A');
    await syncOk(ward);
    const theBed = bed();
    const stay = stayOn(theBed);
    await saveBed(ward.db, theBed, clock.nowMs);
    await admitStay(ward.db, stay, clock.nowMs);
    await syncOk(ward);
    await signInAs(ward, ash);
    return { ward, stay };
  }

  async function serverLog() {
    return store.pullChanges(unit.id, 0, 10_000);
  }
  const readIdsOn = async (tablet: Tablet) => (await tablet.db.reads.toArray()).map((r) => r.id).sort();

  it('answers 409 cursor-ahead, re-sends exactly what the server lost, keeps the later stay edit of another tablet, and ends with 4 reads everywhere', async () => {
    const { ward, stay } = await wardWithAdmittedStay();
    const spare = newTablet();
    await signReads(ward, stay, ash, 2);
    await syncOk(ward);
    // The second tablet edits the stay after the ward tablet admitted it: its version is the latest.
    await enrolAndSignIn(spare, bay, 'Tablet 2, bay A');
    await syncOk(spare);
    await updateStay(spare.db, { ...stay, notes: 'Started on a QT-prolonging drug at 09:00', updatedAtMs: clock.nowMs, updatedBy: 'Bay Invented' }, clock.nowMs);
    await syncOk(spare);
    await syncOk(ward);
    expect((await ward.db.stays.get(stay.id))?.notes).toBe('Started on a QT-prolonging drug at 09:00');

    await backUp('nightly.sqlite');
    const backedUpSeq = (await serverLog()).length;

    // After the backup: two more reads from the ward tablet, which the restore will lose.
    await signReads(ward, stay, ash, 2);
    await syncOk(ward);
    expect((await serverLog()).filter((c) => c.kind === 'read.sign')).toHaveLength(4);

    await restore('nightly.sqlite');
    expect((await serverLog()).length).toBe(backedUpSeq);

    clock.nowMs += 5 * 60_000;
    const run = await syncOk(ward);
    // Only the two lost reads went again; the bed, the admitted stay and the first two reads were still held.
    expect(run.pushed).toMatchObject({ accepted: 2, rejected: 0, deferred: 0 });
    const log = await serverLog();
    expect(log.filter((c) => c.kind === 'read.sign')).toHaveLength(4);
    expect(new Set(log.filter((c) => c.kind === 'read.sign').map((c) => c.recordId)).size).toBe(4);
    expect(log.filter((c) => c.kind === 'stay.put')).toHaveLength(2);
    expect((await store.pullChanges(unit.id, 0, 10_000).then((l) => l.filter((c) => c.kind === 'stay.put').at(-1)?.record as Stay | undefined))?.notes).toBe('Started on a QT-prolonging drug at 09:00');

    expect(await ward.db.reads.count()).toBe(4);
    expect(await ward.db.reads.where('syncStatus').equals('accepted').count()).toBe(4);
    expect((await ward.db.stays.get(stay.id))?.notes).toBe('Started on a QT-prolonging drug at 09:00');
    expect(ward.engine.getState()).toMatchObject({ pendingCount: 0, rejectedCount: 0, lastError: null, restore: { phase: 'done', resentCount: 2 } });
    expect(syncStatusText(ward.engine.getState(), clock.nowMs, 'Europe/London').line).toBe(
      'The unit server was restored from a backup; this tablet re-sent 2 changes it had lost · All reads sent · last synced 09:45',
    );

    // The other tablet had pulled nothing beyond the backup: the log still holds its cursor, so it just pulls the two re-sent reads.
    const other = await syncOk(spare);
    expect(other.pulled.readsAdded).toBe(2);
    expect(await readIdsOn(spare)).toEqual(await readIdsOn(ward));
    expect(await spare.db.reads.count()).toBe(4);
    expect(spare.engine.getState().restore).toBeNull();
  }, 60_000);

  it('notices a restore when other tablets have already pushed past its cursor, by the change at the cursor', async () => {
    const { ward, stay } = await wardWithAdmittedStay();
    const spare = newTablet();
    await syncOk(ward);
    await enrolAndSignIn(spare, bay, 'Tablet 2, bay A');
    await syncOk(spare);
    await backUp('nightly.sqlite');

    await signReads(ward, stay, ash, 1);
    await syncOk(ward);
    const wardRead = (await ward.db.reads.toArray())[0]!;
    await restore('nightly.sqlite');

    // The other tablet charts two reads and sends them first: the server numbers them where the lost read was.
    await signReads(spare, stay, bay, 2);
    await syncOk(spare);
    const before = await serverLog();
    expect(before.filter((c) => c.kind === 'read.sign').map((c) => c.recordId)).not.toContain(wardRead.id);

    await syncOk(ward);
    const log = await serverLog();
    expect(log.filter((c) => c.kind === 'read.sign').map((c) => c.recordId)).toContain(wardRead.id);
    expect(log.filter((c) => c.kind === 'read.sign')).toHaveLength(3);
    expect(await ward.db.reads.count()).toBe(3);
    await syncOk(spare);
    expect(await readIdsOn(spare)).toEqual(await readIdsOn(ward));
    expect(ward.engine.getState().restore).toMatchObject({ phase: 'done', resentCount: 1 });
  }, 60_000);

  it('shows "re-sending" while the recovery is cut off mid-way, keeps the lost read waiting with the reason, and finishes on the next run', async () => {
    const { ward, stay } = await wardWithAdmittedStay();
    await syncOk(ward);
    await backUp('nightly.sqlite');
    await signReads(ward, stay, ash, 1);
    await syncOk(ward);
    await restore('nightly.sqlite');

    // The network drops after the pull that answered 409, before the tablet has read the log again.
    network.pulls = 0;
    network.failPullsAfter = 1;
    const cut = await ward.engine.syncNow();
    expect(cut).toMatchObject({ ok: false, error: { kind: 'unreachable' } });
    expect((await readSyncSetting<RestoreRecovery>(ward.db, restoreRecoveryKey))?.phase).toBe('pulling');
    expect(syncStatusText(ward.engine.getState(), clock.nowMs, 'Europe/London').text).toMatch(/^The unit server was restored from a backup; this tablet is re-sending its reads · /);
    // Nothing on the tablet is lost or marked refused while it waits.
    expect(await ward.db.reads.count()).toBe(1);
    expect(ward.engine.getState().rejectedCount).toBe(0);

    network.failPullsAfter = Number.POSITIVE_INFINITY;
    const resumed = await syncOk(ward);
    expect(resumed.pushed.accepted).toBe(1);
    expect((await serverLog()).filter((c) => c.kind === 'read.sign')).toHaveLength(1);
    expect((await ward.db.reads.toArray())[0]).toMatchObject({ syncStatus: 'accepted' });
    expect((await ward.db.reads.toArray())[0]?.rejectReason).toBeUndefined();
    expect(ward.engine.getState().restore).toMatchObject({ phase: 'done', resentCount: 1 });
  }, 60_000);

  it('after a restore from before the tablet was enrolled: the admin enrols it again, then the bed, the stay and (once their nurse signs in again) the reads all go back', async () => {
    await backUp('before-any-tablet.sqlite');
    const { ward, stay } = await wardWithAdmittedStay();
    await signReads(ward, stay, ash, 2);
    await syncOk(ward);
    await restore('before-any-tablet.sqlite');

    // The server has forgotten the session and the tablet: the tablet asks for a sign-in and keeps everything.
    expect(await ward.engine.syncNow()).toMatchObject({ ok: false, error: { kind: 'signed-out' } });
    expect(ward.engine.getState()).toMatchObject({ signedIn: false, pendingCount: 0 });
    expect(await ward.db.reads.count()).toBe(2);

    // The unit admin signs in, finds the enrolment gone and enrols the tablet again; the bed and stay go back under the admin's session.
    await signIn(ward.db, ward.connection, { username: 'cy', password }, clock.nowMs);
    expect(await enrolmentStillKnown(ward.db, ward.connection)).toBe(false);
    await enrollDevice(ward.db, ward.connection, 'Tablet 1, bay A');
    await ward.engine.refresh();
    const adminRun = await syncOk(ward);
    expect(adminRun.pushed).toMatchObject({ accepted: 2, deferred: 2 });
    expect(ward.engine.getState()).toMatchObject({ lastErrorKind: 'not-yet', restore: { phase: 'sending', resentCount: 4 } });

    // The nurse signs in again on this tablet: her two reads go back, and nothing is doubled.
    await signInAs(ward, ash);
    await syncOk(ward);
    const log = await serverLog();
    expect(log.map((c) => c.kind)).toEqual(['unit.put', 'bed.put', 'stay.put', 'read.sign', 'read.sign']);
    expect(await ward.db.reads.where('syncStatus').equals('accepted').count()).toBe(2);
    expect(ward.engine.getState()).toMatchObject({ pendingCount: 0, rejectedCount: 0, restore: { phase: 'done', resentCount: 4 } });
  }, 60_000);

  it('marks a read the server lost as waiting, with the reason, until it is sent again', async () => {
    const { ward, stay } = await wardWithAdmittedStay();
    await syncOk(ward);
    await backUp('nightly.sqlite');
    await signReads(ward, stay, ash, 1);
    await syncOk(ward);
    await restore('nightly.sqlite');
    // The recovery's steps one by one: begin, then read the log again and sort, before any push.
    const begun = await beginRecovery(ward.db, unit.id, clock.nowMs);
    const sorted = await pullAndSortAfterRestore(ward.db, ward.connection, (await credentialsOf(ward.db))!, begun);
    expect(sorted.recovery).toMatchObject({ phase: 'sending', resentCount: 1 });
    expect((await ward.db.reads.toArray())[0]).toMatchObject({ syncStatus: 'pending', rejectReason: resendReason });
    expect(await ward.db.outbox.where('status').equals('pending').count()).toBe(1);
    expect(await ward.db.outbox.where('status').equals('accepted').count()).toBe(2);
  }, 60_000);
});
