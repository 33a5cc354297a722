import { describe, expect, it } from 'vitest';
import type { Stay } from '../../src/core/records.ts';
import type { OutboxRow } from '../../src/store/db.ts';
import { outboxEntry } from '../../src/store/outbox-entry.ts';
import { anchorStillHolds } from '../../src/sync/pull-changes.ts';
import { HeldByServer, beginRecovery, canonicalJson } from '../../src/sync/recover-after-restore.ts';
import { cursorKey, readSyncSetting, serverVersionKey, writeSyncSetting } from '../../src/sync/sync-settings.ts';
import type { PulledChange } from '../../src/sync/sync-protocol.ts';
import { isServerRestored, serverRestoredError, SyncError } from '../../src/sync/sync-error.ts';
import { bed, newTablet, stay, t0, unit } from './sync-fixtures.ts';

const bedChange = (seq: number, changeId?: string): PulledChange => ({ seq, kind: 'bed.put', record: bed, serverTimeMs: t0, ...(changeId ? { changeId } : {}) });
const stayRow = (record: Stay, changeId: string): OutboxRow => ({ ...outboxEntry({ changeId, kind: 'stay.put', deviceTimeMs: t0, record }, t0), seq: 1, status: 'accepted' });

describe('anchorStillHolds', () => {
  it('holds when the change at the cursor has the change id the tablet received there', () => {
    expect(anchorStillHolds([bedChange(7, 'change-0007'), bedChange(8, 'change-0008')], 7, 'change-0007')).toBe(true);
  });

  it('fails when another change now sits at the cursor (the numbers were handed out again after a restore)', () => {
    expect(anchorStillHolds([bedChange(7, 'change-from-another-tablet')], 7, 'change-0007')).toBe(false);
  });

  it('fails when the log no longer reaches the cursor', () => {
    expect(anchorStillHolds([], 7, 'change-0007')).toBe(false);
    expect(anchorStillHolds([bedChange(8, 'change-0008')], 7, 'change-0007')).toBe(false);
  });

  it('takes an answer without change ids as it is (nothing to compare)', () => {
    expect(anchorStillHolds([bedChange(7)], 7, 'change-0007')).toBe(true);
  });
});

describe('canonicalJson', () => {
  it('writes the same text whatever the key order, and leaves undefined values out', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, 'x'], c: undefined } })).toBe(canonicalJson({ a: { d: [1, 'x'] }, b: 1 }));
    expect(canonicalJson({ a: { d: [1, 'x'] }, b: 1 })).toBe('{"a":{"d":[1,"x"]},"b":1}');
  });

  it('tells different values apart', () => {
    expect(canonicalJson({ notes: 'a' })).not.toBe(canonicalJson({ notes: 'b' }));
    expect(canonicalJson([1, 2])).not.toBe(canonicalJson([2, 1]));
  });
});

describe('HeldByServer', () => {
  it('holds a stay version only when the log has that very version, whatever later versions exist', () => {
    const first = stayRow(stay, 'change-stay-1');
    const edited = stayRow({ ...stay, notes: 'paced since 10:00' }, 'change-stay-2');
    const held = new HeldByServer([first, edited]);
    held.observe([{ seq: 3, kind: 'stay.put', record: { ...stay }, serverTimeMs: t0 }, { seq: 9, kind: 'stay.put', record: { ...stay, notes: 'edited on another tablet' }, serverTimeMs: t0 }]);
    expect(held.holds(first)).toBe(true);
    expect(held.holds(edited)).toBe(false);
  });

  it('holds nothing the log never mentioned', () => {
    expect(new HeldByServer([stayRow(stay, 'change-stay-1')]).holds(stayRow(stay, 'change-stay-1'))).toBe(false);
  });
});

describe('isServerRestored', () => {
  it('is true for the server\'s 409 cursor-ahead and for the tablet\'s own finding, false for other refusals', () => {
    expect(isServerRestored(serverRestoredError())).toBe(true);
    expect(isServerRestored(new SyncError('refused', 'taken', { status: 409, code: 'username-taken' }))).toBe(false);
    expect(isServerRestored(new SyncError('refused', 'bad', { status: 400 }))).toBe(false);
    expect(isServerRestored(new Error('cursor-ahead'))).toBe(false);
  });
});

describe('beginRecovery', () => {
  it('puts this unit\'s accepted rows back to waiting, leaves refused rows and other units\' rows alone, and forgets the cursor and server versions', async () => {
    const db = await newTablet();
    const otherUnitBed = { ...bed, id: 'bed-other-unit', unitId: 'unit-other-0001' };
    await db.outbox.bulkAdd([
      { ...outboxEntry({ changeId: 'change-bed-here', kind: 'bed.put', deviceTimeMs: t0, record: bed }, t0), status: 'accepted' },
      { ...outboxEntry({ changeId: 'change-bed-there', kind: 'bed.put', deviceTimeMs: t0, record: otherUnitBed }, t0), status: 'accepted' },
      { ...outboxEntry({ changeId: 'change-stay-refused', kind: 'stay.put', deviceTimeMs: t0, record: stay }, t0), status: 'rejected', rejectReason: 'refused' },
    ]);
    await writeSyncSetting(db, cursorKey, { unitId: unit.id, cursor: 40, anchorChangeId: 'change-0040' });
    await writeSyncSetting(db, serverVersionKey('bed.put', bed.id), { seq: 2, record: bed });
    const recovery = await beginRecovery(db, unit.id, t0);
    const statuses = Object.fromEntries((await db.outbox.toArray()).map((r) => [r.changeId, r.status]));
    expect(statuses).toEqual({ 'change-bed-here': 'pending', 'change-bed-there': 'accepted', 'change-stay-refused': 'rejected' });
    expect(recovery).toMatchObject({ unitId: unit.id, phase: 'pulling', requeuedSeqs: [1], resentCount: 0, doneAtMs: null });
    expect(await readSyncSetting(db, cursorKey)).toEqual({ unitId: unit.id, cursor: 0 });
    expect(await readSyncSetting(db, serverVersionKey('bed.put', bed.id))).toBeUndefined();
  });
});
