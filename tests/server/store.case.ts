import { randomUUID } from 'node:crypto';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { analyzeReadOrThrow } from '../../src/core/analyze-read.ts';
import { readInputFor } from '../../src/core/read-derivation.ts';
import type { SignedRead, Unit } from '../../src/core/records.ts';
import type { Store, UserRecord } from '../../src/server/storage/store.ts';
import { UnknownUnitError } from '../../src/server/storage/store.ts';
import { baseTimeMs, demoAmendment, demoBed, demoHandover, demoRead, demoStay, demoUnit } from './fixtures.ts';
import type { TestStore } from './test-databases.ts';

/** The storage contract: every implementation of Store must pass this suite unchanged. */
export function runStoreSuite({ newStore }: { newStore: () => Promise<TestStore> }): void {
  let testStore: TestStore;
  let store: Store;
  let unit: Unit;

  beforeEach(async () => {
    testStore = await newStore();
    store = testStore.store;
    unit = demoUnit();
    await store.createUnit(unit, baseTimeMs);
  });
  afterEach(async () => {
    await testStore.dispose();
  });

  const user = (overrides: Partial<UserRecord> = {}): UserRecord => ({
    id: randomUUID(),
    unitId: unit.id,
    username: `nurse-${randomUUID().slice(0, 8)}`,
    name: 'R. Nurse',
    role: 'nurse',
    passwordHash: 'scrypt$not-a-real-hash',
    active: true,
    createdAtMs: baseTimeMs,
    ...overrides,
  });

  const analysisOf = (read: SignedRead) =>
    analyzeReadOrThrow(readInputFor(read.counts, { sex: 'female', paced: false, bundleBranchBlock: false }));

  describe('units', () => {
    it('keeps a unit and refuses a second unit with the same id', async () => {
      expect(await store.getUnit(unit.id)).toEqual(unit);
      expect(await store.createUnit({ ...unit, name: 'Other' }, baseTimeMs)).toBe(false);
      expect((await store.listUnits()).map((u) => u.name)).toEqual(['4 West Telemetry']);
    });

    it('starts a new unit with an empty change log', async () => {
      expect(await store.lastSeq(unit.id)).toBe(0);
      expect(await store.pullChanges(unit.id, 0, 10)).toEqual([]);
    });

    it('answers an unknown unit with UnknownUnitError', async () => {
      await expect(store.lastSeq('no-such-unit')).rejects.toBeInstanceOf(UnknownUnitError);
      await expect(store.inUnitTransaction('no-such-unit', async () => 1)).rejects.toBeInstanceOf(UnknownUnitError);
    });
  });

  describe('users', () => {
    it('finds a user by username whatever its case and refuses the same username twice', async () => {
      const nurse = user({ username: 'RNurse' });
      expect(await store.createUser(nurse)).toBe(true);
      expect(await store.createUser(user({ username: 'rnurse' }))).toBe(false);
      expect((await store.findUserByUsername('RNURSE'))?.id).toBe(nurse.id);
      expect((await store.getUser(nurse.id))?.username).toBe('rnurse');
      expect((await store.inUnitTransaction(unit.id, (tx) => tx.getUser(nurse.id)))?.name).toBe('R. Nurse');
      expect(await store.countUsers()).toBe(1);
    });

    it('changes role, activity and credential hash, and lists the unit in username order', async () => {
      const b = user({ username: 'bnurse' });
      const a = user({ username: 'anurse' });
      await store.createUser(b);
      await store.createUser(a);
      await store.updateUser(b.id, { role: 'charge-nurse', active: false, passwordHash: 'scrypt$new' });
      const changed = await store.getUser(b.id);
      expect([changed?.role, changed?.active, changed?.passwordHash]).toEqual(['charge-nurse', false, 'scrypt$new']);
      expect((await store.listUsers(unit.id)).map((u) => u.username)).toEqual(['anurse', 'bnurse']);
    });
  });

  describe('devices and sessions', () => {
    it('finds an enrolled device by its token hash and marks it revoked once', async () => {
      await store.createDevice({ id: 'dev-00001', unitId: unit.id, label: 'Tablet A', tokenHash: 'h1', enrolledBy: 'admin', enrolledAtMs: baseTimeMs, revokedAtMs: null });
      expect((await store.findDeviceByTokenHash('h1'))?.label).toBe('Tablet A');
      await store.revokeDevice('dev-00001', baseTimeMs + 1000);
      await store.revokeDevice('dev-00001', baseTimeMs + 2000);
      expect((await store.getDevice('dev-00001'))?.revokedAtMs).toBe(baseTimeMs + 1000);
      expect((await store.listDevices(unit.id)).length).toBe(1);
    });

    it('remembers which clinicians signed in on a device', async () => {
      await store.noteDeviceUser('dev-00001', 'user-1', baseTimeMs);
      await store.noteDeviceUser('dev-00001', 'user-1', baseTimeMs + 5);
      expect(await store.isDeviceUser('dev-00001', 'user-1')).toBe(true);
      expect(await store.isDeviceUser('dev-00001', 'user-2')).toBe(false);
      expect(await store.inUnitTransaction(unit.id, (tx) => tx.isDeviceUser('dev-00001', 'user-1'))).toBe(true);
    });

    it('moves a session last-seen time only forward and ends every session of a user', async () => {
      const nurse = user();
      await store.createUser(nurse);
      const session = { id: 's-1', tokenHash: 't1', userId: nurse.id, deviceId: null, createdAtMs: baseTimeMs, lastSeenAtMs: baseTimeMs, expiresAtMs: baseTimeMs + 86_400_000, endedAtMs: null };
      await store.createSession(session);
      await store.createSession({ ...session, id: 's-2', tokenHash: 't2' });
      await store.touchSession('s-1', baseTimeMs + 60_000);
      await store.touchSession('s-1', baseTimeMs + 30_000);
      expect((await store.findSessionByTokenHash('t1'))?.lastSeenAtMs).toBe(baseTimeMs + 60_000);
      await store.endSession('s-1', baseTimeMs + 70_000);
      expect(await store.endSessionsOfUser(nurse.id, baseTimeMs + 80_000)).toBe(1);
      expect((await store.findSessionByTokenHash('t1'))?.endedAtMs).toBe(baseTimeMs + 70_000);
      expect((await store.findSessionByTokenHash('t2'))?.endedAtMs).toBe(baseTimeMs + 80_000);
    });
  });

  describe('sign-in failures', () => {
    it('counts failures within the window per key and clears them', async () => {
      for (const atMs of [1000, 2000, 3000]) await store.recordSignInFailure('rnurse|10.0.0.1', atMs);
      await store.recordSignInFailure('other|10.0.0.1', 2500);
      expect(await store.countSignInFailuresSince('rnurse|10.0.0.1', 2000)).toBe(2);
      expect(await store.oldestSignInFailureSince('rnurse|10.0.0.1', 1500)).toBe(2000);
      await store.clearSignInFailures('rnurse|10.0.0.1');
      expect(await store.countSignInFailuresSince('rnurse|10.0.0.1', 0)).toBe(0);
      expect(await store.countSignInFailuresSince('other|10.0.0.1', 0)).toBe(1);
    });
  });

  describe('audit trail', () => {
    const event = (kind: string, userId: string, serverTimeMs: number) => ({
      unitId: unit.id,
      kind,
      userId,
      username: userId,
      recordId: null,
      deviceId: 'dev-1',
      clientTimeMs: serverTimeMs - 5,
      serverTimeMs,
      detail: null,
    });

    it('lists events newest first, filtered by kind, user, time and page', async () => {
      await store.appendAudit({ ...event('sign-in.failed', 'nobody', 500), unitId: null, userId: null });
      await store.appendAudit(event('sign-in.succeeded', 'u1', 1000));
      await store.appendAudit(event('read.signed', 'u1', 2000));
      await store.appendAudit(event('read.signed', 'u2', 3000));
      await store.appendAudit(event('sign-out', 'u1', 4000));
      await store.appendAudit({ ...event('read.signed', 'u9', 2500), unitId: 'another-unit' });
      const all = await store.listAudit({ unitId: unit.id, limit: 10 });
      expect(all.map((e) => e.serverTimeMs)).toEqual([4000, 3000, 2000, 1000, 500]);
      expect(all[0]?.clientTimeMs).toBe(3995);
      expect((await store.listAudit({ unitId: unit.id, kind: 'read.signed', limit: 10 })).map((e) => e.userId)).toEqual(['u2', 'u1']);
      expect((await store.listAudit({ unitId: unit.id, userId: 'u1', fromMs: 1500, toMs: 4000, limit: 10 })).map((e) => e.kind)).toEqual(['sign-out', 'read.signed']);
      const firstPage = await store.listAudit({ unitId: unit.id, limit: 2 });
      const nextPage = await store.listAudit({ unitId: unit.id, limit: 2, beforeId: firstPage[1]?.id ?? 0 });
      expect(nextPage.map((e) => e.serverTimeMs)).toEqual([2000, 1000]);
      expect((await store.listAudit({ unitId: 'another-unit', limit: 10 })).map((e) => e.kind)).toEqual(['read.signed', 'sign-in.failed']);
    });

    it('offers no way to change an audit event: the store has only append and list, and the database refuses updates and deletes', async () => {
      const methodNames = Object.getOwnPropertyNames(Object.getPrototypeOf(store)).filter((n) => /audit/i.test(n));
      expect(methodNames.sort()).toEqual(['appendAudit', 'listAudit']);
      await store.appendAudit(event('read.signed', 'u1', 1000));
      await expect(testStore.rawExecute(`update audit_events set kind = 'nothing'`)).rejects.toThrow(/append-only/);
      await expect(testStore.rawExecute(`delete from audit_events`)).rejects.toThrow(/append-only/);
      expect((await store.listAudit({ unitId: unit.id, limit: 10 })).map((e) => e.kind)).toEqual(['read.signed']);
    });
  });

  describe('unit transactions and the change log', () => {
    const logged = (changeId: string, kind: string, recordId: string, record: unknown) => ({
      changeId,
      kind,
      recordId,
      record,
      derived: null,
      coreVersion: null,
      serverTimeMs: baseTimeMs,
      deviceTimeMs: baseTimeMs,
      userId: 'u1',
      deviceId: 'dev-1',
    });

    it('numbers changes 1, 2, 3 within a unit and pulls them after a cursor, a page at a time', async () => {
      const bed = demoBed(unit.id);
      await store.inUnitTransaction(unit.id, async (tx) => {
        for (let i = 1; i <= 3; i += 1) {
          const seq = await tx.appendChange(logged(`change-${i}-000`, 'bed.put', bed.id, { ...bed, sortOrder: i }));
          await tx.putBed({ ...bed, sortOrder: i }, seq);
        }
      });
      expect(await store.lastSeq(unit.id)).toBe(3);
      expect((await store.pullChanges(unit.id, 0, 2)).map((c) => c.seq)).toEqual([1, 2]);
      const last = await store.pullChanges(unit.id, 2, 2);
      expect(last.map((c) => [c.seq, c.changeId, (c.record as { sortOrder: number }).sortOrder])).toEqual([[3, 'change-3-000', 3]]);
      expect(await store.inUnitTransaction(unit.id, (tx) => tx.getBed(bed.id))).toEqual({ ...bed, sortOrder: 3 });
      const asText = await store.pullChangesText(unit.id, 1, 5);
      expect(asText.map((c) => [c.seq, c.changeId, JSON.parse(c.recordJson).sortOrder, c.derivedJson])).toEqual([
        [2, 'change-2-000', 2, null],
        [3, 'change-3-000', 3, null],
      ]);
    });

    it('keeps nothing of a transaction that throws: no change, no counter step, no answer', async () => {
      await expect(
        store.inUnitTransaction(unit.id, async (tx) => {
          await tx.appendChange(logged('change-x-000', 'bed.put', 'b', {}));
          await tx.rememberAnswer('change-x-000', { changeId: 'change-x-000', status: 'accepted', seq: 1 }, baseTimeMs);
          throw new Error('power cut');
        }),
      ).rejects.toThrow('power cut');
      expect(await store.lastSeq(unit.id)).toBe(0);
      expect(await store.pullChanges(unit.id, 0, 10)).toEqual([]);
      expect(await store.inUnitTransaction(unit.id, (tx) => tx.answerOf('change-x-000'))).toBeUndefined();
    });

    it('remembers the first answer to a change id, per unit', async () => {
      const answer = { changeId: 'change-a-000', status: 'rejected' as const, reason: 'Unknown stay', errors: [{ field: 'record.stayId', message: 'record.stayId: unknown stay' }] };
      await store.inUnitTransaction(unit.id, (tx) => tx.rememberAnswer('change-a-000', answer, baseTimeMs));
      expect(await store.inUnitTransaction(unit.id, (tx) => tx.answerOf('change-a-000'))).toEqual(answer);
      const other = demoUnit();
      await store.createUnit(other, baseTimeMs);
      expect(await store.inUnitTransaction(other.id, (tx) => tx.answerOf('change-a-000'))).toBeUndefined();
    });

    it('gives every one of 20 concurrent transactions its own dense numbers, none twice', async () => {
      await Promise.all(
        Array.from({ length: 20 }, (_, i) =>
          store.inUnitTransaction(unit.id, async (tx) => {
            await tx.appendChange(logged(`change-c-${String(i).padStart(3, '0')}`, 'bed.put', 'b', {}));
          }),
        ),
      );
      const seqs = (await store.pullChanges(unit.id, 0, 100)).map((c) => c.seq);
      expect(seqs).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    });

    it('replaces a stay with its latest version in server order and keeps only this unit’s records visible', async () => {
      const bed = demoBed(unit.id);
      const stay = demoStay(unit.id, bed.id);
      await store.inUnitTransaction(unit.id, async (tx) => {
        await tx.putStay(stay, 1);
        await tx.putStay({ ...stay, alias: 'J.K.2', updatedAtMs: 1 }, 2);
      });
      const other = demoUnit();
      await store.createUnit(other, baseTimeMs);
      expect((await store.inUnitTransaction(unit.id, (tx) => tx.getStay(stay.id)))?.alias).toBe('J.K.2');
      expect(await store.inUnitTransaction(other.id, (tx) => tx.getStay(stay.id))).toBeUndefined();
    });

    it('finds the previous read of a stay by strip time, not by arrival', async () => {
      const stay = demoStay(unit.id, 'bed-000001');
      const early = demoRead(stay, 'u1', { stripTimeMs: baseTimeMs });
      const late = demoRead(stay, 'u1', { stripTimeMs: baseTimeMs + 8 * 3_600_000 });
      const middle = demoRead(stay, 'u1', { stripTimeMs: baseTimeMs + 4 * 3_600_000 });
      await store.inUnitTransaction(unit.id, async (tx) => {
        await tx.insertRead(early, analysisOf(early), 1, baseTimeMs);
        await tx.insertRead(late, analysisOf(late), 2, baseTimeMs);
        await tx.insertRead(middle, analysisOf(middle), 3, baseTimeMs);
      });
      const found = await store.inUnitTransaction(unit.id, async (tx) => ({
        beforeLate: (await tx.previousRead(stay.id, late.stripTimeMs, late.id))?.read.id,
        beforeMiddle: (await tx.previousRead(stay.id, middle.stripTimeMs, middle.id))?.read.id,
        beforeEarly: await tx.previousRead(stay.id, early.stripTimeMs, early.id),
        stored: await tx.getRead(middle.id),
      }));
      expect(found.beforeLate).toBe(middle.id);
      expect(found.beforeMiddle).toBe(early.id);
      expect(found.beforeEarly).toBeUndefined();
      expect(found.stored?.read).toEqual(middle);
      expect(found.stored?.analysis.rate.rateBpm).toBe(75); // 1500 / 20 small boxes: common practice, no source
      expect(found.stored?.seq).toBe(3);
    });

    it('keeps amendments beside the read in server order, never replacing the read', async () => {
      const stay = demoStay(unit.id, 'bed-000001');
      const read = demoRead(stay, 'u1');
      const first = demoAmendment(read, 'u1', { qtSmallBoxes: 10 }, { createdAtMs: baseTimeMs + 9_000_000 });
      const second = demoAmendment(read, 'u1', { notes: 'second look' }, { createdAtMs: baseTimeMs });
      await store.inUnitTransaction(unit.id, async (tx) => {
        await tx.insertRead(read, analysisOf(read), 1, baseTimeMs);
        await tx.insertAmendment(first, analysisOf(read), 2, baseTimeMs);
        await tx.insertAmendment(second, analysisOf(read), 3, baseTimeMs);
      });
      const result = await store.inUnitTransaction(unit.id, async (tx) => ({ list: await tx.amendmentsOf(read.id), one: await tx.getAmendment(second.id), read: await tx.getRead(read.id) }));
      expect(result.list.map((a) => a.amendment.id)).toEqual([first.id, second.id]);
      expect(result.one?.seq).toBe(3);
      expect(result.read?.read.counts.qtSmallBoxes).toBe(9);
    });

    it('replaces a handover with its latest version', async () => {
      const stay = demoStay(unit.id, 'bed-000001');
      const given = demoHandover(stay, 'u1');
      await store.inUnitTransaction(unit.id, async (tx) => {
        await tx.putHandover(given, 1);
        await tx.putHandover({ ...given, receivedById: 'u2-000000', receivedByName: 'N. Other', receivedAtMs: baseTimeMs }, 2);
      });
      expect((await store.inUnitTransaction(unit.id, (tx) => tx.getHandover(given.id)))?.receivedByName).toBe('N. Other');
    });

    it('writes audit events inside the unit transaction, kept or dropped with it', async () => {
      await store.inUnitTransaction(unit.id, (tx) => tx.appendAudit({ unitId: unit.id, kind: 'read.signed', userId: 'u1', username: 'u1', recordId: 'r1', deviceId: null, clientTimeMs: null, serverTimeMs: 1, detail: null }));
      await store
        .inUnitTransaction(unit.id, async (tx) => {
          await tx.appendAudit({ unitId: unit.id, kind: 'read.signed', userId: 'u1', username: 'u1', recordId: 'r2', deviceId: null, clientTimeMs: null, serverTimeMs: 2, detail: null });
          throw new Error('rolled back');
        })
        .catch(() => undefined);
      expect((await store.listAudit({ unitId: unit.id, limit: 10 })).map((e) => e.recordId)).toEqual(['r1']);
    });

    it('updates the unit record under the lock', async () => {
      await store.inUnitTransaction(unit.id, (tx) => tx.putUnit({ ...unit, readIntervalHours: 2 }));
      expect((await store.getUnit(unit.id))?.readIntervalHours).toBe(2);
      expect((await store.inUnitTransaction(unit.id, (tx) => tx.getUnit())).readIntervalHours).toBe(2);
    });
  });
}
