import { useMemo, useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import { loadBedData } from '../../store/board-query.ts';
import { previousFiguresBefore } from '../../store/derive-stay-reads.ts';
import { signRead } from '../../store/sign-read.ts';
import { StorageFullError } from '../../store/storage-full.ts';
import { useCharting } from '../app-context.ts';
import { FiguresPanel } from '../components/FiguresPanel.tsx';
import { FlagBanners } from '../components/FlagBanner.tsx';
import { FormErrors } from '../components/FormErrors.tsx';
import { LiveSummaryBar } from '../components/LiveSummaryBar.tsx';
import { ReadCountsFields } from '../components/ReadCountsFields.tsx';
import { ReasonFields } from '../components/ReasonFields.tsx';
import { RhythmFields } from '../components/RhythmFields.tsx';
import { StayFacts } from '../components/StayFacts.tsx';
import { StripTimeFields } from '../components/StripTimeFields.tsx';
import { leaveFlash } from '../flash-message.ts';
import { fieldHasText, signingErrors } from '../read-form-checks.ts';
import { liveRead, messageInWords, stripTimeOf } from '../read-form-values.ts';
import { go, hrefOf } from '../routes.ts';
import { clockText } from '../time-text.ts';
import { useLiveQuery } from '../use-live-query.ts';
import type { DraftStatus } from '../use-read-draft.ts';
import { useReadDraft } from '../use-read-draft.ts';

const draftWords: Record<DraftStatus, string> = {
  loading: 'Opening draft…',
  new: 'Nothing typed yet',
  unsaved: 'Typing…',
  saving: 'Saving draft…',
  saved: 'Draft saved on this tablet',
  'storage-full': 'Draft NOT saved: storage full. Keep this screen open.',
};

/** A new read: counts typed or stepped, figures and banners from the core as typed, rhythm, reason, sign. */
export function NewRead({ bedId }: { bedId: string }) {
  const { db, unit, policy, clinician, deviceId } = useCharting();
  const data = useLiveQuery(() => loadBedData(db, bedId), [db, bedId]);
  const stay = data?.stay ?? null;
  const draft = useReadDraft(db, clinician.id, stay, unit);
  const [signTried, setSignTried] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const form = draft.form;
  const strip = form ? stripTimeOf(form, unit.timeZone) : null;
  const stripMs = strip?.ok ? strip.ms : null;
  const previous = useMemo(
    () => (stay && data && stripMs !== null ? previousFiguresBefore(stay, data.reads, data.amendments, policy, stripMs) : undefined),
    [stay, data, policy, stripMs],
  );

  if (!data || (stay && !form)) return <p class="loading">Opening the read…</p>;
  if (!data.bed) return <p>This bed is not on this tablet. <a href={hrefOf({ screen: 'board' })}>Back to beds</a></p>;
  if (!stay || !form) {
    return (
      <p>
        No patient is monitored on {data.bed.label}. <a href={hrefOf({ screen: 'start-monitoring', bedId })}>Start monitoring</a>
      </p>
    );
  }

  const live = liveRead(form, stay, previous, policy);
  const errors = signingErrors(form, live, unit.timeZone, Date.now());
  const shown = errors.filter((e) => signTried || fieldHasText(form, e.field) || e.field === 'stripTime');
  const errorOf = (field: string) => {
    const e = shown.find((x) => x.field === field);
    return e ? messageInWords(e) : null;
  };

  const sign = async () => {
    setSignTried(true);
    setProblem(null);
    if (errors.length > 0 || !strip?.ok) return;
    setSaving(true);
    const nowMs = Date.now();
    try {
      await draft.flush();
      await signRead(db, {
        unit,
        stay,
        stripTimeMs: strip.ms,
        counts: live.counts,
        reason: form.reason,
        reasonText: form.reasonText,
        rhythmText: form.rhythmText,
        ectopy: form.ectopy,
        notes: form.notes,
        author: { id: clinician.id, name: clinician.name },
        deviceId,
        enteredAtMs: Math.min(draft.startedAtMs, nowMs),
        nowMs,
        ...(draft.draftId ? { draftId: draft.draftId } : {}),
      });
      draft.markSigned();
      leaveFlash(`Read saved: ${data.bed!.label}, ${stay.alias}, strip time ${clockText(strip.ms, unit.timeZone)}.`);
      go({ screen: 'bed', bedId });
    } catch (error) {
      setSaving(false);
      if (error instanceof StorageFullError) setProblem(error.message);
      else if (error instanceof ValidationError) setProblem(error.errors.map(messageInWords).join(' '));
      else setProblem('The read could not be saved. Your typing is kept on screen; try again.');
    }
  };

  return (
    <section class="read-layout" aria-labelledby="read-title">
      <div class="read-inputs">
        <div class="screen-head">
          <h1 id="read-title">
            New read: {data.bed.label}, {stay.alias}
          </h1>
          <StayFacts stay={stay} compact />
          <p class={`draft-status draft-${draft.status}`} role="status">
            {draftWords[draft.status]}
            {draft.status === 'saved' && draft.savedAtMs ? ` (${clockText(draft.savedAtMs, unit.timeZone)})` : ''}
          </p>
        </div>
        <LiveSummaryBar analysis={live.analysis} />
        <StripTimeFields form={form} setForm={draft.setForm} error={errorOf('stripTime')} />
        <ReadCountsFields form={form} setForm={draft.setForm} errorOf={errorOf} />
        <RhythmFields form={form} setForm={draft.setForm} questions={live.analysis?.questions ?? []} />
        <ReasonFields form={form} setForm={draft.setForm} reasonTextError={errorOf('reasonText')} />
        <div class="sign-area">
          {problem ? (
            <p class="problem" role="alert">
              {problem}
            </p>
          ) : null}
          {signTried ? <FormErrors messages={errors.map(messageInWords)} label="Fix before signing" /> : null}
          <button type="button" class="button button-primary button-sign" disabled={saving} onClick={() => void sign()}>
            {saving ? 'Saving…' : `Sign read as ${clinician.name}`}
          </button>
        </div>
        <div class="actions">
            <a class="button" href={hrefOf({ screen: 'bed', bedId })}>
              Leave (draft kept)
            </a>
            <button
              type="button"
              class="button button-quiet"
              onClick={() => {
                if (confirm('Throw this draft away? What you typed will be lost.')) void draft.discard();
              }}
            >
              Discard draft
            </button>
        </div>
      </div>
      <aside class="read-results" aria-label="Figures and cautions">
        <FiguresPanel analysis={live.analysis} />
        <FlagBanners flags={live.analysis?.flags ?? []} />
      </aside>
    </section>
  );
}
