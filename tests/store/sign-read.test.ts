import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import { saveDraft } from '../../src/store/drafts.ts';
import { draftIdFor } from '../../src/store/read-draft.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { author, emptyForm, hourMs, normalCounts, seededDb, stay, t0, unit } from './fixtures.ts';

const base = { unit, stay, reason: 'routine' as const, author, deviceId: 'tablet-test', enteredAtMs: t0 };

describe('signRead', () => {
  it('stores the read with the figures the core derived and a pending sync state', async () => {
    const db = await seededDb();
    const saved = await signRead(db, { ...base, stripTimeMs: t0, counts: normalCounts, nowMs: t0 + 60_000 });
    const stored = await db.reads.get(saved.id);
    expect(stored?.syncStatus).toBe('pending');
    // 20 small boxes at 25 mm/s = 800 ms = 75 bpm: the 1500 rule (Hall & Hall 2021, Guyton and Hall Textbook of Medical Physiology, normal ECG chapter).
    expect(stored?.analysis?.rate.rateBpm).toBe(75);
    // Fridericia: 400 / 0.8^(1/3) = 430.9 ms (Fridericia 1920, Die Systolendauer im Elektrokardiogramm bei normalen Menschen und bei Herzkranken).
    expect(stored?.analysis?.qtc?.byFormula.fridericia).toBeCloseTo(430.9, 1);
    expect(stored?.authorName).toBe('Ann Test');
  });

  it('writes the read and its outbox change together, with the read as the change record', async () => {
    const db = await seededDb();
    const saved = await signRead(db, { ...base, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
    const outbox = await db.outbox.toArray();
    expect(outbox).toHaveLength(1);
    expect(outbox[0]).toMatchObject({ kind: 'read.sign', status: 'pending', attempts: 0, seq: 1 });
    expect(outbox[0]!.change.record).toMatchObject({ id: saved.id, stayId: stay.id, counts: { qtSmallBoxes: 10 } });
  });

  it('removes the draft it came from in the same transaction', async () => {
    const db = await seededDb();
    const draftId = draftIdFor(author.id, stay.id);
    await saveDraft(db, { id: draftId, authorId: author.id, stayId: stay.id, bedId: stay.bedId, unitId: unit.id, form: emptyForm, startedAtMs: t0, updatedAtMs: t0 });
    await signRead(db, { ...base, stripTimeMs: t0, counts: normalCounts, nowMs: t0, draftId });
    expect(await db.drafts.count()).toBe(0);
  });

  it('compares with the last read, so a QTc rise of more than 60 ms is flagged urgent', async () => {
    const db = await seededDb();
    await signRead(db, { ...base, stripTimeMs: t0, counts: normalCounts, nowMs: t0 });
    // QT 12 boxes = 480 ms at R-R 800 ms: Fridericia 517 ms, up 86 ms; a rise over 60 ms is high risk
    // (Drew et al. 2010, Prevention of torsade de pointes in hospital settings).
    const later = await signRead(db, { ...base, stripTimeMs: t0 + 4 * hourMs, counts: { ...normalCounts, qtSmallBoxes: 12 }, nowMs: t0 + 4 * hourMs });
    const codes = later.analysis?.flags.map((f) => f.code);
    expect(codes).toContain('qtc-rise-since-last-read');
    expect(later.analysis?.flags.find((f) => f.code === 'qtc-rise-since-last-read')?.severity).toBe('urgent');
  });

  it('refuses counts out of range with a message naming the field, and stores nothing', async () => {
    const db = await seededDb();
    const attempt = signRead(db, { ...base, stripTimeMs: t0, counts: { ...normalCounts, qtSmallBoxes: 40, rrSmallBoxes: [50] }, nowMs: t0 });
    await expect(attempt).rejects.toBeInstanceOf(ValidationError);
    await expect(attempt).rejects.toThrow(/qtSmallBoxes must be between 3 and 25 small boxes/);
    expect(await db.reads.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('refuses a read without an R-R count or six-second count, naming rrSmallBoxes', async () => {
    const db = await seededDb();
    const attempt = signRead(db, { ...base, stripTimeMs: t0, counts: { ...normalCounts, rrSmallBoxes: [] }, nowMs: t0 });
    await expect(attempt).rejects.toThrow(/rrSmallBoxes: enter at least one R-R count/);
  });

  it('refuses a strip time after the monitoring ended', async () => {
    const db = await seededDb();
    const ended = { ...stay, endMs: t0 - hourMs };
    await expect(signRead(db, { ...base, stay: ended, stripTimeMs: t0, counts: normalCounts, nowMs: t0 })).rejects.toThrow(/stripTimeMs: this patient's monitoring ended/);
  });
});
