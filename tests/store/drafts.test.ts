import { describe, expect, it } from 'vitest';
import { discardDraft, draftsOf, loadDraft, saveDraft } from '../../src/store/drafts.ts';
import { RhythmDb } from '../../src/store/db.ts';
import { draftIdFor } from '../../src/store/read-draft.ts';
import { author, emptyForm, otherAuthor, seededDb, stay, t0, unit } from './fixtures.ts';

const draftOf = (who: { id: string }, qt: string) => ({
  id: draftIdFor(who.id, stay.id), authorId: who.id, stayId: stay.id, bedId: stay.bedId, unitId: unit.id,
  form: { ...emptyForm, qtSmallBoxes: qt, rrSmallBoxes: ['20', '4.'] }, startedAtMs: t0, updatedAtMs: t0,
});

describe('drafts', () => {
  it('keeps half-typed text exactly as typed', async () => {
    const db = await seededDb();
    await saveDraft(db, draftOf(author, '1o'));
    const loaded = await loadDraft(db, author.id, stay.id);
    expect(loaded?.form.qtSmallBoxes).toBe('1o');
    expect(loaded?.form.rrSmallBoxes).toEqual(['20', '4.']);
  });

  it('survives closing and reopening the database (a reload or crash)', async () => {
    const db = await seededDb();
    await saveDraft(db, draftOf(author, '10'));
    db.close();
    const reopened = new RhythmDb(db.name);
    expect((await loadDraft(reopened, author.id, stay.id))?.form.qtSmallBoxes).toBe('10');
  });

  it('shows a nurse only their own draft for a bed', async () => {
    const db = await seededDb();
    await saveDraft(db, draftOf(author, '10'));
    await saveDraft(db, draftOf(otherAuthor, '12'));
    expect((await loadDraft(db, author.id, stay.id))?.form.qtSmallBoxes).toBe('10');
    expect((await loadDraft(db, otherAuthor.id, stay.id))?.form.qtSmallBoxes).toBe('12');
    expect((await draftsOf(db, otherAuthor.id)).map((d) => d.authorId)).toEqual([otherAuthor.id]);
  });

  it('replaces the draft on each save and removes it when discarded', async () => {
    const db = await seededDb();
    await saveDraft(db, draftOf(author, '10'));
    await saveDraft(db, draftOf(author, '10.5'));
    expect(await db.drafts.count()).toBe(1);
    await discardDraft(db, author.id, stay.id);
    expect(await loadDraft(db, author.id, stay.id)).toBeUndefined();
  });
});
