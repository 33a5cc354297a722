import type { Bed, ReadCounts, Stay, Unit } from '../../src/core/records.ts';
import { RhythmDb } from '../../src/store/db.ts';
import type { SignReadInput } from '../../src/store/sign-read.ts';
import { buildSignedRead, signRead } from '../../src/store/sign-read.ts';
import type { OutboxRow, StoredRead } from '../../src/store/db.ts';
import { outboxEntry } from '../../src/store/outbox-entry.ts';
import { uuidV7 } from '../../src/store/uuid-v7.ts';
import type { ServerConnection } from '../../src/sync/server-call.ts';
import type { SyncEngine, SyncEngineOptions } from '../../src/sync/sync-engine.ts';
import { deviceKey, sessionKey, writeSyncSetting } from '../../src/sync/sync-settings.ts';
import type { FakeUnitServer } from './fake-unit-server.ts';
import { normalCounts, unit as storeUnit } from '../store/fixtures.ts';

export const hourMs = 3_600_000;
/** 10 March 2026, 08:00 UTC: the start of an invented day shift. */
export const t0 = Date.UTC(2026, 2, 10, 8, 0);

export const unit: Unit = { ...storeUnit, id: 'unit-sync-0001', name: 'Invented Ward 4 East', updatedAtMs: t0 - 48 * hourMs };

export const bed: Bed = { id: 'bed-sync-0001', unitId: unit.id, label: 'Bed 1', sortOrder: 0, active: true };

export const stay: Stay = {
  id: 'stay-sync-0001',
  unitId: unit.id,
  bedId: bed.id,
  alias: 'K.V.',
  sex: 'male',
  paced: false,
  bundleBranchBlock: false,
  qtProlongingDrugs: '',
  notes: '',
  startMs: t0 - 24 * hourMs,
  endMs: null,
  updatedAtMs: t0 - 24 * hourMs,
  updatedBy: 'Invented Admin',
};

/** 20 small boxes at 25 mm/s: R-R 800 ms, 75 bpm by the 1500 rule (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology). */
export const counts: ReadCounts = normalCounts;

export const nurseAsh = { id: 'user-ash', name: 'Ash Invented', username: 'ash', role: 'nurse' as const, password: 'correct horse' };
export const nurseBay = { id: 'user-bay', name: 'Bay Invented', username: 'bay', role: 'nurse' as const, password: 'battery staple' };
export const adminCy = { id: 'user-cy', name: 'Cy Invented', username: 'cy', role: 'unit-admin' as const, password: 'admin words' };

let dbCount = 0;
/** A fresh tablet database on fake-indexeddb holding the unit, bed and stay (as after a first pull). */
export async function newTablet(): Promise<RhythmDb> {
  dbCount += 1;
  const db = new RhythmDb(`sync-test-${dbCount}-${Math.random().toString(36).slice(2)}`);
  await db.units.put(unit);
  await db.beds.put(bed);
  await db.stays.put(stay);
  return db;
}

/** Gives a tablet a server session for a user, as if that nurse had signed in online earlier. */
export async function signInTablet(db: RhythmDb, server: FakeUnitServer, userId: string): Promise<void> {
  const user = server.users.find((u) => u.id === userId)!;
  const { password: _password, ...publicUser } = user;
  await writeSyncSetting(db, sessionKey, { token: server.sessionFor(userId), expiresAtMs: server.serverNowMs + 12 * hourMs, user: publicUser, signedInAtMs: server.serverNowMs });
  await writeSyncSetting(db, deviceKey, { deviceId: 'device-1', deviceToken: 'device-token-1' });
}

/** Signs one read on a tablet through the store, which writes the read and its outbox change together. */
export async function signReadAt(db: RhythmDb, nowMs: number, options: Partial<SignReadInput> = {}): Promise<StoredRead> {
  return signRead(db, {
    unit,
    stay,
    stripTimeMs: nowMs - 60_000,
    counts,
    reason: 'routine',
    author: { id: nurseAsh.id, name: nurseAsh.name },
    deviceId: 'tablet-under-test',
    enteredAtMs: nowMs - 120_000,
    nowMs,
    ...options,
  });
}

/** A manual clock with timers: nothing fires until the test moves time on. */
export class ManualClock {
  nowMs: number;
  private timers: Array<{ id: number; atMs: number; run: () => void }> = [];
  private nextId = 1;
  /** Every delay asked for, in order (to check backoff). */
  readonly delaysMs: number[] = [];

  constructor(nowMs: number) {
    this.nowMs = nowMs;
  }

  now = (): number => this.nowMs;

  setTimeout = (run: () => void, delayMs: number): unknown => {
    const id = this.nextId;
    this.nextId += 1;
    this.delaysMs.push(delayMs);
    this.timers.push({ id, atMs: this.nowMs + delayMs, run });
    return id;
  };

  clearTimeout = (handle: unknown): void => {
    this.timers = this.timers.filter((t) => t.id !== handle);
  };

  pendingTimers(): number {
    return this.timers.length;
  }

  /** When the next timer falls due, or null when none is set. */
  nextTimerAtMs(): number | null {
    return this.timers.length === 0 ? null : Math.min(...this.timers.map((t) => t.atMs));
  }

  /** Moves time on, running each timer that falls due, in time order. */
  advance(ms: number): void {
    const until = this.nowMs + ms;
    for (;;) {
      const due = this.timers.filter((t) => t.atMs <= until).sort((a, b) => a.atMs - b.atMs)[0];
      if (!due) break;
      this.timers = this.timers.filter((t) => t !== due);
      this.nowMs = due.atMs;
      due.run();
    }
    this.nowMs = until;
  }
}

/** A connection to a fake server on a manual clock. */
export function connectionTo(server: FakeUnitServer, clock: ManualClock): ServerConnection {
  return { fetch: server.fetch, baseUrl: 'http://unit.test', setTimeout: clock.setTimeout, clearTimeout: clock.clearTimeout, requestTimeoutMs: 30_000 };
}

/** Counts of one tablet's reads: all, and by sync state. */
export async function readCounts(db: RhythmDb): Promise<{ all: number; accepted: number; pending: number; rejected: number }> {
  const rows = await db.reads.toArray();
  return {
    all: rows.length,
    accepted: rows.filter((r) => r.syncStatus === 'accepted').length,
    pending: rows.filter((r) => r.syncStatus === 'pending').length,
    rejected: rows.filter((r) => r.syncStatus === 'rejected').length,
  };
}

/** A fake unit server holding the unit, bed and stay (seq 1 to 3) and the three invented accounts. */
export async function newServer(serverNowMs: number = t0): Promise<FakeUnitServer> {
  const { FakeUnitServer } = await import('./fake-unit-server.ts');
  const server = new FakeUnitServer(serverNowMs, unit.id);
  for (const user of [nurseAsh, nurseBay, adminCy]) server.addUser(user);
  await server.preload([
    { changeId: 'setup-unit-0001', kind: 'unit.put', deviceTimeMs: unit.updatedAtMs, record: unit },
    { changeId: 'setup-bed-00001', kind: 'bed.put', deviceTimeMs: unit.updatedAtMs, record: bed },
    { changeId: 'setup-stay-0001', kind: 'stay.put', deviceTimeMs: stay.updatedAtMs, record: stay },
  ]);
  return server;
}

/**
 * Many signed reads at once, one minute apart, each with its outbox change, written in one
 * transaction. The records are built by the store's own builder; only the figures are left out,
 * which keeps tests of hundreds of reads quick (push and pull do not read them).
 */
export async function bulkSignReads(db: RhythmDb, howMany: number, startMs: number, deviceId = 'tablet-under-test'): Promise<string[]> {
  const stored: StoredRead[] = [];
  const rows: OutboxRow[] = [];
  for (let i = 0; i < howMany; i += 1) {
    const nowMs = startMs + i * 60_000;
    const read = buildSignedRead({ unit, stay, stripTimeMs: nowMs - 60_000, counts, reason: 'routine', author: { id: nurseAsh.id, name: nurseAsh.name }, deviceId, enteredAtMs: nowMs - 120_000, nowMs });
    stored.push({ ...read, analysis: null, syncStatus: 'pending' });
    rows.push(outboxEntry({ changeId: uuidV7(nowMs), kind: 'read.sign', deviceTimeMs: nowMs, record: read }, nowMs));
  }
  await db.transaction('rw', [db.reads, db.outbox], async () => {
    await db.reads.bulkAdd(stored);
    await db.outbox.bulkAdd(rows);
  });
  return stored.map((r) => r.id);
}

/** Push then pull for one tablet, as one engine run does, with the tablet's session. */
export async function pushThenPull(db: RhythmDb, server: FakeUnitServer, clock: ManualClock, limit?: number): Promise<void> {
  const { pushOutbox } = await import('../../src/sync/push-outbox.ts');
  const { pullChanges } = await import('../../src/sync/pull-changes.ts');
  const { credentialsOf } = await import('../../src/sync/server-session.ts');
  const credentials = await credentialsOf(db);
  if (!credentials) throw new Error('tablet is not signed in');
  const connection = connectionTo(server, clock);
  await pushOutbox(db, connection, credentials);
  await pullChanges(db, connection, credentials, unit.id, limit);
}

/** A sync engine for a tablet against a fake server on a manual clock; no live query or window events unless asked. */
export async function engineFor(db: RhythmDb, server: FakeUnitServer, clock: ManualClock, options: Partial<SyncEngineOptions> = {}): Promise<SyncEngine> {
  const { createSyncEngine } = await import('../../src/sync/sync-engine.ts');
  return createSyncEngine({
    db,
    fetch: server.fetch,
    baseUrl: 'http://unit.test',
    now: clock.now,
    random: () => 0.5,
    setTimeout: clock.setTimeout,
    clearTimeout: clock.clearTimeout,
    events: null,
    isOnline: () => true,
    watchOutbox: false,
    ...options,
  });
}
