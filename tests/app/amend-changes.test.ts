import { describe, expect, it } from 'vitest';
import { amendmentChanges, formFromRead } from '../../src/app/amend-changes.ts';
import { countsFromForm } from '../../src/app/read-form-values.ts';
import type { SignedRead } from '../../src/core/records.ts';
import { normalCounts, stay, t0, unit } from '../store/fixtures.ts';

const read: SignedRead = {
  id: 'read-test-0001', unitId: unit.id, bedId: stay.bedId, stayId: stay.id, stripTimeMs: t0, enteredAtMs: t0, signedAtMs: t0,
  authorId: 'clin-test-ann', authorName: 'Ann Test', deviceId: 't', reason: 'routine', counts: normalCounts, notes: 'Asleep',
};
const edited = (over: Partial<{ counts: typeof normalCounts; notes: string; stripTimeMs: number }>) => ({ counts: normalCounts, rhythmText: '', ectopy: '', notes: 'Asleep', stripTimeMs: t0, ...over });

describe('amendmentChanges', () => {
  it('turns the read back into the form it was typed in, counts as text', () => {
    const form = formFromRead(read, 'UTC');
    expect(form).toMatchObject({ stripLocalDate: '2026-03-10', stripLocalTime: '08:00', rrSmallBoxes: ['20', '20'], qtSmallBoxes: '10', notes: 'Asleep' });
    expect(countsFromForm(form).counts).toEqual(normalCounts);
  });
  it('lists only what changed', () => {
    expect(amendmentChanges(read, edited({ counts: { ...normalCounts, qtSmallBoxes: 11 }, stripTimeMs: t0 - 60_000 })).changes).toEqual({ qtSmallBoxes: 11, stripTimeMs: t0 - 60_000 });
    expect(amendmentChanges(read, edited({})).changes).toEqual({});
  });
  it('refuses to remove a count, naming it', () => {
    const { qtSmallBoxes: _dropped, ...withoutQt } = normalCounts;
    const result = amendmentChanges(read, edited({ counts: withoutQt }));
    expect(result.errors.map((e) => e.field)).toEqual(['qtSmallBoxes']);
    expect(result.changes).toEqual({});
  });
});
