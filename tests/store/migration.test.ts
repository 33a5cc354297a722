import { describe, expect, it } from 'vitest';
import Dexie from 'dexie';
import { RhythmDb } from '../../src/store/db.ts';
import { currentSchemaVersion, schemaVersions } from '../../src/store/schema-versions.ts';
import { author, emptyForm, normalCounts, stay, t0, unit } from './fixtures.ts';

/** Opens a database at an earlier layout, exactly as a tablet on that version had it. */
function databaseAtVersion(name: string, version: number): Dexie {
  const old = new Dexie(name);
  for (const v of schemaVersions.filter((s) => s.version <= version)) {
    const step = old.version(v.version).stores(v.stores);
    if (v.upgrade) step.upgrade(v.upgrade);
  }
  return old;
}

const readV1 = (id: string) => ({
  id, unitId: unit.id, bedId: stay.bedId, stayId: stay.id, stripTimeMs: t0, enteredAtMs: t0, signedAtMs: t0,
  authorId: author.id, authorName: author.name, deviceId: 'tablet-old', reason: 'routine', counts: normalCounts, analysis: null,
});
const outboxV1 = (recordId: string, status: string, rejectReason?: string) => ({
  changeId: `chg-${recordId}`, kind: 'read.sign', change: { changeId: `chg-${recordId}`, kind: 'read.sign', deviceTimeMs: t0, record: readV1(recordId) },
  createdAtMs: t0, status, ...(rejectReason ? { rejectReason } : {}),
});

describe('tablet database migrations', () => {
  it('lists versions in increasing order, ending at the current version', () => {
    const versions = schemaVersions.map((v) => v.version);
    expect(versions).toEqual([...versions].sort((a, b) => a - b));
    expect(currentSchemaVersion).toBe(2);
  });

  describe('from version 1', () => {
    async function migratedFromV1() {
      const name = `migrate-v1-${Math.random()}`;
      const old = databaseAtVersion(name, 1);
      await old.table('units').put(unit);
      await old.table('reads').bulkPut([readV1('read-accepted-1'), readV1('read-rejected-1'), readV1('read-unsent-01')]);
      await old.table('outbox').bulkAdd([
        outboxV1('read-accepted-1', 'accepted'),
        outboxV1('read-rejected-1', 'rejected', 'Stay closed on the server'),
        outboxV1('read-unsent-01', 'pending'),
      ]);
      await old.table('drafts').put({ id: `${author.id}:${stay.id}`, authorId: author.id, stayId: stay.id, bedId: stay.bedId, unitId: unit.id, form: { ...emptyForm, qtSmallBoxes: '9.5' }, startedAtMs: t0, updatedAtMs: t0 });
      expect(old.verno).toBe(1);
      old.close();
      const db = new RhythmDb(name);
      await db.open();
      return db;
    }

    it('opens at the current version with every record still there', async () => {
      const db = await migratedFromV1();
      expect(db.verno).toBe(currentSchemaVersion);
      expect(await db.reads.count()).toBe(3);
      expect(await db.outbox.count()).toBe(3);
      expect((await db.units.get(unit.id))?.name).toBe('Test unit');
    });

    it("copies each read's answer from the server out of the outbox onto the read", async () => {
      const db = await migratedFromV1();
      expect((await db.reads.get('read-accepted-1'))?.syncStatus).toBe('accepted');
      expect(await db.reads.get('read-rejected-1')).toMatchObject({ syncStatus: 'rejected', rejectReason: 'Stay closed on the server' });
      expect((await db.reads.get('read-unsent-01'))?.syncStatus).toBe('pending');
      expect((await db.reads.where('syncStatus').equals('pending').primaryKeys())).toEqual(['read-unsent-01']);
    });

    it('counts no send attempts yet on old outbox rows', async () => {
      const db = await migratedFromV1();
      expect((await db.outbox.toArray()).map((r) => r.attempts)).toEqual([0, 0, 0]);
    });

    it('keeps the half-typed draft and finds it by its author', async () => {
      const db = await migratedFromV1();
      const drafts = await db.drafts.where('authorId').equals(author.id).toArray();
      expect(drafts.map((d) => d.form.qtSmallBoxes)).toEqual(['9.5']);
    });
  });
});
