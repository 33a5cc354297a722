import { useEffect, useMemo, useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import { currentReadView } from '../../core/read-derivation.ts';
import type { ReadDraftForm } from '../../store/read-draft.ts';
import { AmendNotAllowedError, amendRead } from '../../store/amend-read.ts';
import { deriveStayReads } from '../../core/stay-reads.ts';
import { previousFiguresBefore } from '../../store/derive-stay-reads.ts';
import { StorageFullError } from '../../store/storage-full.ts';
import { amendmentChanges, formFromRead } from '../amend-changes.ts';
import { useCharting } from '../app-context.ts';
import { AmendHistory } from '../components/AmendHistory.tsx';
import { FiguresPanel } from '../components/FiguresPanel.tsx';
import { FlagBanners } from '../components/FlagBanner.tsx';
import { FormErrors } from '../components/FormErrors.tsx';
import { ReadCountsFields } from '../components/ReadCountsFields.tsx';
import { RefusedReadNote } from '../components/RefusedReadNote.tsx';
import { RhythmFields } from '../components/RhythmFields.tsx';
import { StripTimeFields } from '../components/StripTimeFields.tsx';
import { leaveFlash } from '../flash-message.ts';
import { liveRead, messageInWords, stripTimeOf } from '../read-form-values.ts';
import { go, hrefOf } from '../routes.ts';
import { useLiveQuery } from '../use-live-query.ts';

/** Amend a signed read: change fields with a reason; the original and every earlier amendment stay readable. */
export function AmendRead({ readId }: { readId: string }) {
  const { db, unit, policy, clinician, deviceId } = useCharting();
  const data = useLiveQuery(async () => {
    const read = await db.reads.get(readId);
    if (!read) return { read: null, stay: null, reads: [], amendments: [] };
    const stay = (await db.stays.get(read.stayId)) ?? null;
    return { read, stay, reads: await db.reads.where('stayId').equals(read.stayId).toArray(), amendments: await db.amendments.where('stayId').equals(read.stayId).toArray() };
  }, [db, readId]);
  const [form, setFormState] = useState<ReadDraftForm | null>(null);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<string[]>([]);
  const [saving, setSaving] = useState(false);
  const view = useMemo(() => (data?.read ? currentReadView(data.read, data.amendments) : null), [data]);
  useEffect(() => {
    if (view && !form) setFormState(formFromRead(view.current, unit.timeZone));
  }, [view, form, unit.timeZone]);

  if (!data) return <p class="loading">Opening the read…</p>;
  if (!data.read || !data.stay || !view) return <p>This read is not on this tablet. <a href={hrefOf({ screen: 'board' })}>Back to beds</a></p>;
  const { read, stay } = data;
  const mine = read.authorId === clinician.id;
  const refused = read.syncStatus === 'rejected';
  const original = deriveStayReads(data.reads.map((r) => (r.id === read.id ? read : r)), data.amendments.filter((a) => a.readId !== read.id), stay, policy).find((d) => d.view.read.id === read.id);
  const strip = form ? stripTimeOf(form, unit.timeZone) : null;
  const previous = strip?.ok ? previousFiguresBefore(stay, data.reads, data.amendments, policy, strip.ms, read.id) : undefined;
  const live = form ? liveRead(form, stay, previous, policy) : null;
  const setForm = (update: (f: ReadDraftForm) => ReadDraftForm) => setFormState((f) => (f ? update(f) : f));
  const errorOf = (field: string) => {
    const e = live?.errors.find((x) => x.field === field);
    return e ? messageInWords(e) : null;
  };

  const save = async () => {
    if (!form || !live || !strip) return;
    if (!strip.ok) return setErrors([strip.error.message]);
    if (live.errors.length > 0) return setErrors(live.errors.map(messageInWords));
    const { changes, errors: changeErrors } = amendmentChanges(view.current, { counts: live.counts, rhythmText: form.rhythmText, ectopy: form.ectopy, notes: form.notes, stripTimeMs: strip.ms });
    if (changeErrors.length > 0) return setErrors(changeErrors.map(messageInWords));
    setSaving(true);
    try {
      await amendRead(db, { unit, stay, readId: read.id, changes, reason, author: { id: clinician.id, name: clinician.name }, deviceId, nowMs: Date.now() });
      leaveFlash('Amendment saved. The original read stays in the history.');
      go({ screen: 'bed', bedId: read.bedId });
    } catch (error) {
      setSaving(false);
      if (error instanceof ValidationError) setErrors(error.errors.map(messageInWords));
      else if (error instanceof AmendNotAllowedError || error instanceof StorageFullError) setErrors([error.message]);
      else setErrors(['The amendment could not be saved; your changes are still on screen. Try again.']);
    }
  };

  return (
    <section aria-labelledby="amend-title">
      <h1 id="amend-title">{refused ? 'Read refused by the unit server' : mine ? 'Amend a signed read' : 'Read history'}: {stay.alias}</h1>
      <p class="sub">
        Signed by {read.authorName}. A signed read is never changed: an amendment is added beside it, with its reason, and the original stays readable.
      </p>
      {refused ? <RefusedReadNote reason={read.rejectReason} bedId={read.bedId} /> : null}
      <AmendHistory read={read} amendments={view.amendments} originalAnalysis={original?.analysis ?? null} timeZone={unit.timeZone} />
      {refused ? null : !mine ? (
        <p class="problem">Only {read.authorName}, who signed this read, may amend it. Add a new read if the figures have changed.</p>
      ) : form && live ? (
        <div class="amend-grid">
          <div>
            <h2>Change fields</h2>
            <StripTimeFields form={form} setForm={setForm} error={strip && !strip.ok ? strip.error.message : null} />
            <ReadCountsFields form={form} setForm={setForm} errorOf={errorOf} />
            <RhythmFields form={form} setForm={setForm} questions={live.analysis?.questions ?? []} />
            <label class="field">
              Notes
              <textarea rows={3} value={form.notes} onInput={(e) => setForm((f) => ({ ...f, notes: e.currentTarget.value }))} />
            </label>
            <label class="field">
              Why is the read amended? (required)
              <textarea rows={2} value={reason} onInput={(e) => setReason(e.currentTarget.value)} />
            </label>
            <FormErrors messages={errors} />
            <div class="actions">
              <button type="button" class="button button-primary" disabled={saving} onClick={() => void save()}>
                {saving ? 'Saving…' : `Save amendment as ${clinician.name}`}
              </button>
              <a class="button" href={hrefOf({ screen: 'bed', bedId: read.bedId })}>
                Cancel
              </a>
            </div>
          </div>
          <aside aria-label="Figures after the amendment">
            <h2>Figures after the amendment</h2>
            <FiguresPanel analysis={live.analysis} />
            <FlagBanners flags={live.analysis?.flags ?? []} />
          </aside>
        </div>
      ) : null}
    </section>
  );
}
