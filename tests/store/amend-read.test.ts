import { describe, expect, it } from 'vitest';
import { currentReadView } from '../../src/core/read-derivation.ts';
import { AmendNotAllowedError, amendRead } from '../../src/store/amend-read.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { author, normalCounts, otherAuthor, seededDb, stay, t0, unit } from './fixtures.ts';

async function signedOne() {
  const db = await seededDb();
  const read = await signRead(db, { unit, stay, reason: 'routine', author, deviceId: 'tablet-test', enteredAtMs: t0, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
  return { db, read };
}

describe('amendRead', () => {
  it('keeps the signed read as it was and re-derives the current figures from the amended counts', async () => {
    const { db, read } = await signedOne();
    await amendRead(db, { unit, stay, readId: read.id, changes: { qtSmallBoxes: 11 }, reason: 'Recounted the QT on lead II', author, deviceId: 'tablet-test', nowMs: t0 + 600_000 });
    const stored = await db.reads.get(read.id);
    expect(stored?.counts.qtSmallBoxes).toBe(10);
    // QT 11 boxes = 440 ms: 40 ms per small box at 25 mm/s (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology).
    expect(stored?.analysis?.intervals.qtMs).toBe(440);
    const view = currentReadView(stored!, await db.amendments.toArray());
    expect(view.current.counts.qtSmallBoxes).toBe(11);
    expect(view.changedFields).toEqual(['qtSmallBoxes']);
  });

  it('writes the amendment and its outbox change together', async () => {
    const { db, read } = await signedOne();
    const amendment = await amendRead(db, { unit, stay, readId: read.id, changes: { notes: 'Patient asleep' }, reason: 'Added context', author, deviceId: 'tablet-test', nowMs: t0 + 1 });
    const kinds = (await db.outbox.orderBy('seq').toArray()).map((r) => r.kind);
    expect(kinds).toEqual(['read.sign', 'amendment.add']);
    expect((await db.outbox.toArray())[1]!.change.record).toMatchObject({ id: amendment.id, readId: read.id, changes: { notes: 'Patient asleep' } });
    expect(amendment.syncStatus).toBe('pending');
  });

  it('refuses another nurse amending the read and names who signed it', async () => {
    const { db, read } = await signedOne();
    const attempt = amendRead(db, { unit, stay, readId: read.id, changes: { notes: 'x' }, reason: 'Because', author: otherAuthor, deviceId: 'tablet-test', nowMs: t0 + 1 });
    await expect(attempt).rejects.toBeInstanceOf(AmendNotAllowedError);
    await expect(attempt).rejects.toThrow(/Only Ann Test/);
    expect(await db.amendments.count()).toBe(0);
  });

  it('asks for a reason of at least 3 characters', async () => {
    const { db, read } = await signedOne();
    await expect(amendRead(db, { unit, stay, readId: read.id, changes: { notes: 'x' }, reason: ' ', author, deviceId: 'tablet-test', nowMs: t0 + 1 })).rejects.toThrow(/reason: say why the read is amended/);
  });

  it('refuses an amendment that changes nothing', async () => {
    const { db, read } = await signedOne();
    await expect(amendRead(db, { unit, stay, readId: read.id, changes: {}, reason: 'Nothing', author, deviceId: 'tablet-test', nowMs: t0 + 1 })).rejects.toThrow(/changes: nothing was changed/);
  });

  it('refuses amended counts out of range, naming the field, and changes nothing', async () => {
    const { db, read } = await signedOne();
    await expect(amendRead(db, { unit, stay, readId: read.id, changes: { prSmallBoxes: 40 }, reason: 'Recount', author, deviceId: 'tablet-test', nowMs: t0 + 1 })).rejects.toThrow(/prSmallBoxes/);
    expect(await db.amendments.count()).toBe(0);
    expect((await db.reads.get(read.id))?.analysis?.intervals.prMs).toBe(160);
  });
});
