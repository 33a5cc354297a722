import { useCallback, useEffect, useRef, useState } from 'preact/hooks';
import type { Stay, Unit } from '../core/records.ts';
import type { RhythmDb } from '../store/db.ts';
import { discardDraft, loadDraft, saveDraft } from '../store/drafts.ts';
import type { ReadDraftForm } from '../store/read-draft.ts';
import { draftIdFor } from '../store/read-draft.ts';
import { StorageFullError } from '../store/storage-full.ts';
import { registerOpenReadForm } from './open-read-form.ts';
import { newReadForm } from './read-form-values.ts';

/** How long typing pauses before the draft is written; short, so a crash loses at most a keystroke or two. */
const autosaveDelayMs = 400;

export type DraftStatus = 'loading' | 'new' | 'unsaved' | 'saving' | 'saved' | 'storage-full';

/** The read form's state, kept as a draft of this author for this stay: loaded, autosaved, flushed on lock, update and page hide. */
export function useReadDraft(db: RhythmDb, authorId: string, stay: Stay | null, unit: Unit) {
  const [form, setFormState] = useState<ReadDraftForm | null>(null);
  const [status, setStatus] = useState<DraftStatus>('loading');
  const [savedAtMs, setSavedAtMs] = useState<number | null>(null);
  const formRef = useRef<ReadDraftForm | null>(null);
  const dirty = useRef(false);
  const typed = useRef(false);
  const startedAtMs = useRef(Date.now());
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);

  const stayId = stay?.id ?? null;
  useEffect(() => {
    if (!stay) return;
    let cancelled = false;
    void loadDraft(db, authorId, stay.id).then((draft) => {
      if (cancelled) return;
      if (draft) {
        formRef.current = draft.form;
        startedAtMs.current = draft.startedAtMs;
        typed.current = true;
        setSavedAtMs(draft.updatedAtMs);
        setStatus('saved');
      } else {
        formRef.current = newReadForm(unit, Date.now());
        setStatus('new');
      }
      setFormState(formRef.current);
    });
    return () => {
      cancelled = true;
    };
    // A new stay or author means another draft; unit defaults only shape a new form.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [db, authorId, stayId]);

  const flush = useCallback(async () => {
    clearTimeout(timer.current);
    if (!dirty.current || !stay || !formRef.current) return;
    dirty.current = false;
    setStatus('saving');
    const nowMs = Date.now();
    try {
      await saveDraft(db, {
        id: draftIdFor(authorId, stay.id),
        authorId,
        stayId: stay.id,
        bedId: stay.bedId,
        unitId: stay.unitId,
        form: formRef.current,
        startedAtMs: startedAtMs.current,
        updatedAtMs: nowMs,
      });
      setSavedAtMs(nowMs);
      setStatus(dirty.current ? 'unsaved' : 'saved');
    } catch (error) {
      dirty.current = true;
      setStatus(error instanceof StorageFullError ? 'storage-full' : 'unsaved');
    }
  }, [db, authorId, stay]);

  const setForm = useCallback(
    (update: (f: ReadDraftForm) => ReadDraftForm) => {
      if (!formRef.current) return;
      formRef.current = update(formRef.current);
      typed.current = true;
      dirty.current = true;
      setFormState(formRef.current);
      setStatus('unsaved');
      clearTimeout(timer.current);
      timer.current = setTimeout(() => void flush(), autosaveDelayMs);
    },
    [flush],
  );

  useEffect(() => {
    const unregister = registerOpenReadForm({ flush, hasTyping: () => typed.current });
    const onHide = () => void flush();
    const onVisibility = () => {
      if (document.visibilityState === 'hidden') void flush();
    };
    window.addEventListener('pagehide', onHide);
    document.addEventListener('visibilitychange', onVisibility);
    return () => {
      void flush();
      unregister();
      window.removeEventListener('pagehide', onHide);
      document.removeEventListener('visibilitychange', onVisibility);
    };
  }, [flush]);

  /** Forgets the typing on purpose: the nurse chose to discard the draft. */
  const discard = useCallback(async () => {
    clearTimeout(timer.current);
    dirty.current = false;
    typed.current = false;
    if (stay) await discardDraft(db, authorId, stay.id);
    formRef.current = newReadForm(unit, Date.now());
    startedAtMs.current = Date.now();
    setFormState(formRef.current);
    setStatus('new');
  }, [db, authorId, stay, unit]);

  /** After signing: the store removed the draft in the signing transaction, so nothing is left to save. */
  const markSigned = useCallback(() => {
    clearTimeout(timer.current);
    dirty.current = false;
    typed.current = false;
  }, []);

  return { form, setForm, status, savedAtMs, flush, discard, markSigned, startedAtMs: startedAtMs.current, draftId: stay ? draftIdFor(authorId, stay.id) : null };
}
