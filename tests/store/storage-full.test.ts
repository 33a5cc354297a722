import { describe, expect, it } from 'vitest';
import { loadDraft, saveDraft } from '../../src/store/drafts.ts';
import { draftIdFor } from '../../src/store/read-draft.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { StorageFullError, isQuotaError } from '../../src/store/storage-full.ts';
import { fillDisk } from './full-disk.ts';
import { author, emptyForm, normalCounts, seededDb, stay, t0, unit } from './fixtures.ts';

const draftId = draftIdFor(author.id, stay.id);
const draft = { id: draftId, authorId: author.id, stayId: stay.id, bedId: stay.bedId, unitId: unit.id, form: { ...emptyForm, qtSmallBoxes: '10' }, startedAtMs: t0, updatedAtMs: t0 };

describe('a full disk', () => {
  it.each([
    ['plain QuotaExceededError', false],
    ['QuotaExceededError wrapped in an AbortError', true],
  ])('turns a %s on signing into a clear StorageFullError, saves no read and keeps the draft', async (_label, wrapped) => {
    const db = await seededDb();
    await saveDraft(db, draft);
    await fillDisk(db, ['reads', 'outbox', 'drafts'], wrapped);
    const attempt = signRead(db, { unit, stay, reason: 'routine', author, deviceId: 't', enteredAtMs: t0, stripTimeMs: t0, counts: normalCounts, nowMs: t0, draftId });
    await expect(attempt).rejects.toBeInstanceOf(StorageFullError);
    await expect(attempt).rejects.toThrow(/storage is full, so this was NOT saved/);
    expect(await db.reads.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
    expect((await loadDraft(db, author.id, stay.id))?.form.qtSmallBoxes).toBe('10');
  });

  it('turns a full disk on draft autosave into a StorageFullError, keeping the previous draft', async () => {
    const db = await seededDb();
    await saveDraft(db, draft);
    await fillDisk(db, ['drafts'], true);
    await expect(saveDraft(db, { ...draft, form: { ...draft.form, qtSmallBoxes: '11' } })).rejects.toBeInstanceOf(StorageFullError);
    expect((await loadDraft(db, author.id, stay.id))?.form.qtSmallBoxes).toBe('10');
  });

  describe('isQuotaError', () => {
    it('recognises the quota error by name, by legacy code 22 and inside inner or cause', () => {
      expect(isQuotaError(new DOMException('x', 'QuotaExceededError'))).toBe(true);
      expect(isQuotaError({ name: 'Error', code: 22 })).toBe(true);
      expect(isQuotaError({ name: 'AbortError', inner: { name: 'QuotaExceededError' } })).toBe(true);
      expect(isQuotaError(new Error('wrapped', { cause: { name: 'QuotaExceededError' } }))).toBe(true);
    });
    it('does not mistake other failures for a full disk', () => {
      expect(isQuotaError(new DOMException('x', 'AbortError'))).toBe(false);
      expect(isQuotaError(new Error('ConstraintError'))).toBe(false);
      expect(isQuotaError(null)).toBe(false);
      expect(isQuotaError('QuotaExceededError')).toBe(false);
    });
  });
});
