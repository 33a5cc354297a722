import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import { summarizeHandover } from '../../src/core/handover-summary.ts';
import { shiftAt } from '../../src/core/shifts.ts';
import { HandoverLockedError, acknowledgeHandover, saveHandover } from '../../src/store/handovers.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import { author, bed, otherAuthor, seededDb, stay, t0, unit } from './fixtures.ts';

const summary = () => summarizeHandover({ unit, stay, bedLabel: bed.label, shift: shiftAt(t0, unit.shiftPattern, unit.timeZone), reads: [], amendments: [], nowMs: t0 }, unitPolicyOf(unit));

describe('handovers on the tablet', () => {
  it('writes the given handover and its outbox change together', async () => {
    const db = await seededDb();
    const stored = await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: '  Quiet night.  ', giver: author, nowMs: t0, id: 'handover-0001' });
    expect(stored).toMatchObject({ id: 'handover-0001', stayId: stay.id, shiftKey: '2026-03-10/Day', nurseText: 'Quiet night.', givenByName: 'Ann Test', givenAtMs: t0, syncStatus: 'pending' });
    const outbox = await db.outbox.toArray();
    expect(outbox.map((r) => [r.kind, r.status, r.change.record.id])).toEqual([['handover.put', 'pending', 'handover-0001']]);
  });

  it('adds the receiving nurse and time, and queues a second change', async () => {
    const db = await seededDb();
    await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: '', giver: author, nowMs: t0, id: 'handover-0002' });
    const received = await acknowledgeHandover(db, { handoverId: 'handover-0002', receiver: otherAuthor, nowMs: t0 + 60_000 });
    expect(received).toMatchObject({ givenByName: 'Ann Test', receivedById: otherAuthor.id, receivedByName: 'Bob Test', receivedAtMs: t0 + 60_000 });
    const records = (await db.outbox.toArray()).map((r) => r.change.record as { receivedByName?: string });
    expect(records.map((r) => r.receivedByName ?? null)).toEqual([null, 'Bob Test']);
  });

  it('refuses the giver as receiver and leaves nothing half-written', async () => {
    const db = await seededDb();
    await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: '', giver: author, nowMs: t0, id: 'handover-0003' });
    const refused = await acknowledgeHandover(db, { handoverId: 'handover-0003', receiver: author, nowMs: t0 + 60_000 }).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(ValidationError);
    expect((refused as ValidationError).errors[0]?.field).toBe('receivedById');
    expect((await db.handovers.get('handover-0003'))?.receivedById).toBeUndefined();
    expect(await db.outbox.count()).toBe(1);
  });

  it('refuses a second acknowledgement', async () => {
    const db = await seededDb();
    await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: '', giver: author, nowMs: t0, id: 'handover-0004' });
    await acknowledgeHandover(db, { handoverId: 'handover-0004', receiver: otherAuthor, nowMs: t0 + 60_000 });
    const again = await acknowledgeHandover(db, { handoverId: 'handover-0004', receiver: { id: 'clin-test-cy', name: 'Cy Test' }, nowMs: t0 + 120_000 }).catch((e: unknown) => e);
    expect((again as ValidationError).errors[0]?.message).toMatch(/already acknowledged by Bob Test/);
  });

  it('lets only the giver give an unreceived handover again, keeping its id', async () => {
    const db = await seededDb();
    await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: 'first', giver: author, nowMs: t0, id: 'handover-0005' });
    const again = await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: 'second', giver: author, nowMs: t0 + 60_000, replacesId: 'handover-0005' });
    expect(again).toMatchObject({ id: 'handover-0005', nurseText: 'second', givenAtMs: t0 + 60_000 });
    const byOther = await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: 'third', giver: otherAuthor, nowMs: t0 + 120_000, replacesId: 'handover-0005' }).catch((e: unknown) => e);
    expect(byOther).toBeInstanceOf(HandoverLockedError);
    expect((await db.handovers.get('handover-0005'))?.nurseText).toBe('second');
  });

  it('refuses to give again a handover already received', async () => {
    const db = await seededDb();
    await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: 'first', giver: author, nowMs: t0, id: 'handover-0006' });
    await acknowledgeHandover(db, { handoverId: 'handover-0006', receiver: otherAuthor, nowMs: t0 + 60_000 });
    const again = await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: 'changed', giver: author, nowMs: t0 + 120_000, replacesId: 'handover-0006' }).catch((e: unknown) => e);
    expect((again as Error).message).toBe('This handover was already received by Bob Test; it stays as written.');
  });

  it('names the field when the giver has no name', async () => {
    const db = await seededDb();
    const refused = await saveHandover(db, { unitId: unit.id, summary: summary(), nurseText: '', giver: { id: author.id, name: ' ' }, nowMs: t0 }).catch((e: unknown) => e);
    expect((refused as ValidationError).errors.map((e) => e.field)).toEqual(['givenByName']);
    expect(await db.handovers.count()).toBe(0);
  });
});
