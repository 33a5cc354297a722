import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openSqliteStore } from '../../src/server/storage/open-sqlite-store.ts';
import { changeOf, demoBed, demoRead, demoStay } from './fixtures.ts';
import { pullAll, push } from './sync-helpers.ts';
import type { Clinician, TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

describe('pull', () => {
  let t: TestApp;
  let nurse: Clinician;

  beforeEach(async () => {
    t = await openTestApp();
    nurse = await t.clinician('nurse');
    const bed = demoBed(t.unit.id);
    const stay = demoStay(t.unit.id, bed.id);
    await push(t.admin, [changeOf('bed.put', bed), changeOf('stay.put', stay)]);
    await push(nurse, Array.from({ length: 7 }, (_, i) => changeOf('read.sign', demoRead(stay, nurse.user.id, { stripTimeMs: stay.startMs + i * 4 * 3_600_000 }))));
  });
  afterEach(async () => {
    await t.close();
  });

  it('starts with the unit itself, then every change in server order', async () => {
    const { changes, cursor } = await pullAll(nurse);
    expect(changes.map((c) => c.kind)).toEqual(['unit.put', 'bed.put', 'stay.put', ...Array(7).fill('read.sign')]);
    expect(changes.map((c) => c.seq)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(cursor).toBe('10');
  });

  it('pages with hasMore and a cursor, never skipping or repeating a change', async () => {
    const first = (await nurse.get('/api/sync/pull?after=0&limit=4')).json() as { changes: Array<{ seq: number }>; cursor: string; hasMore: boolean };
    expect([first.changes.map((c) => c.seq), first.cursor, first.hasMore]).toEqual([[1, 2, 3, 4], '4', true]);
    const { changes } = await pullAll(nurse, first.cursor, 3);
    expect(changes.map((c) => c.seq)).toEqual([5, 6, 7, 8, 9, 10]);
    const empty = (await nurse.get('/api/sync/pull?after=10')).json() as { changes: unknown[]; cursor: string; hasMore: boolean };
    expect(empty).toEqual({ changes: [], cursor: '10', hasMore: false });
  });

  it('answers 409 cursor-ahead to a cursor beyond the last change (the server went back to a backup)', async () => {
    const answer = await nurse.get('/api/sync/pull?after=11');
    expect([answer.statusCode, (answer.json() as { code: string }).code]).toEqual([409, 'cursor-ahead']);
  });

  it('carries the server’s analysis and core version with each read, and device time as data', async () => {
    const read = (await pullAll(nurse)).changes.find((c) => c.kind === 'read.sign');
    expect(read?.derived?.coreVersion).toBe('1.0.0');
    expect(read?.coreVersion).toBe('1.0.0');
    expect(typeof read?.deviceTimeMs).toBe('number');
    expect(read?.serverTimeMs).toBe(t.clock.nowMs);
  });

  it('shows a unit only its own changes', async () => {
    const other = await openTestApp({ store: t.store, adminUsername: 'admin-b' });
    const { changes } = await pullAll(other.admin);
    expect(changes.map((c) => c.kind)).toEqual(['unit.put']);
    await other.app.close();
  });

  it('refuses a bad cursor or limit with the field and the allowed range', async () => {
    const badAfter = await nurse.get('/api/sync/pull?after=yesterday');
    expect([badAfter.statusCode, (badAfter.json() as { errors: Array<{ field: string }> }).errors[0]?.field]).toEqual([400, 'after']);
    const badLimit = await nurse.get('/api/sync/pull?limit=501');
    expect(badLimit.json()).toEqual({ errors: [{ field: 'limit', message: 'limit must be a whole number from 1 to 500', min: 1, max: 500 }] });
    expect((await nurse.get('/api/sync/pull?limit=0')).statusCode).toBe(400);
    expect((await nurse.get('/api/sync/pull?since=3')).statusCode).toBe(400);
  });
});

describe('two units on one server', () => {
  it('numbers each unit’s changes on its own', async () => {
    const store = await openSqliteStore(':memory:');
    const a = await openTestApp({ store });
    const b = await openTestApp({ store, adminUsername: 'admin-b' });
    await push(a.admin, [changeOf('bed.put', demoBed(a.unit.id))]);
    await push(b.admin, [changeOf('bed.put', demoBed(b.unit.id)), changeOf('bed.put', demoBed(b.unit.id, 'Bed 2'))]);
    expect((await pullAll(a.admin)).changes.map((c) => c.seq)).toEqual([1, 2]);
    expect((await pullAll(b.admin)).changes.map((c) => c.seq)).toEqual([1, 2, 3]);
    await a.app.close();
    await b.close();
  });
});
