import { useEffect, useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Stay } from '../../core/records.ts';
import { ageBands } from '../../core/records.ts';
import { loadBedData } from '../../store/board-query.ts';
import { admitStay, endStay, updateStay } from '../../store/stays.ts';
import { StorageFullError } from '../../store/storage-full.ts';
import { uuidV7 } from '../../store/uuid-v7.ts';
import { FormErrors } from '../components/FormErrors.tsx';
import { useCharting } from '../app-context.ts';
import { leaveFlash } from '../flash-message.ts';
import { go, hrefOf } from '../routes.ts';
import { useLiveQuery } from '../use-live-query.ts';

interface StayForm {
  alias: string;
  recordNumber: string;
  sex: Stay['sex'];
  ageBand: Stay['ageBand'] | '';
  paced: boolean;
  bundleBranchBlock: boolean;
  qtProlongingDrugs: string;
  baselineQtcMs: string;
  notes: string;
}

const blank: StayForm = { alias: '', recordNumber: '', sex: 'unknown', ageBand: '', paced: false, bundleBranchBlock: false, qtProlongingDrugs: '', baselineQtcMs: '', notes: '' };

function formOf(stay: Stay): StayForm {
  return {
    alias: stay.alias,
    recordNumber: stay.recordNumber ?? '',
    sex: stay.sex,
    ageBand: stay.ageBand ?? '',
    paced: stay.paced,
    bundleBranchBlock: stay.bundleBranchBlock,
    qtProlongingDrugs: stay.qtProlongingDrugs,
    baselineQtcMs: stay.baselineQtcMs === undefined ? '' : String(stay.baselineQtcMs),
    notes: stay.notes,
  };
}

/** Start monitoring a patient on a bed, or change the patient's details (the facts that change how figures are read). */
export function StartMonitoring({ bedId }: { bedId: string }) {
  const { db, unit, clinician } = useCharting();
  const data = useLiveQuery(() => loadBedData(db, bedId), [db, bedId]);
  const [form, setForm] = useState<StayForm>(blank);
  const [errors, setErrors] = useState<string[]>([]);
  const existing = data?.stay ?? null;
  useEffect(() => {
    if (existing) setForm(formOf(existing));
  }, [existing?.id]);

  if (!data) return <p class="loading">Opening…</p>;
  if (!data.bed) return <p>This bed is not on this tablet.</p>;
  const bed = data.bed;
  const set = <K extends keyof StayForm>(key: K, value: StayForm[K]) => setForm((f) => ({ ...f, [key]: value }));

  const save = async () => {
    const nowMs = Date.now();
    const baseline = form.baselineQtcMs.trim() === '' ? undefined : Number(form.baselineQtcMs);
    if (baseline !== undefined && !Number.isFinite(baseline)) {
      setErrors(['Baseline QTc: type a number of ms between 200 and 800, or leave it empty.']);
      return;
    }
    const stay: Stay = {
      id: existing?.id ?? `stay-${uuidV7(nowMs)}`,
      unitId: unit.id,
      bedId,
      alias: form.alias.trim(),
      sex: form.sex,
      paced: form.paced,
      bundleBranchBlock: form.bundleBranchBlock,
      qtProlongingDrugs: form.qtProlongingDrugs.trim(),
      notes: form.notes.trim(),
      startMs: existing?.startMs ?? nowMs,
      endMs: null,
      updatedAtMs: nowMs,
      updatedBy: clinician.name,
    };
    if (form.recordNumber.trim()) stay.recordNumber = form.recordNumber.trim();
    if (form.ageBand) stay.ageBand = form.ageBand;
    if (baseline !== undefined) stay.baselineQtcMs = baseline;
    try {
      if (existing) await updateStay(db, stay, nowMs);
      else await admitStay(db, stay, nowMs);
      leaveFlash(existing ? `Details saved for ${stay.alias}.` : `Monitoring started: ${bed.label}, ${stay.alias}. A baseline read is due now.`);
      go({ screen: 'bed', bedId });
    } catch (error) {
      if (error instanceof ValidationError) setErrors(error.errors.map((e) => e.message));
      else if (error instanceof StorageFullError) setErrors([error.message]);
      else setErrors(['Could not save; nothing was lost. Try again.']);
    }
  };

  const end = async () => {
    if (!existing || !confirm(`End monitoring of ${existing.alias} on ${bed.label}? The reads stay on record.`)) return;
    const nowMs = Date.now();
    await endStay(db, existing.id, nowMs, clinician.name, nowMs);
    leaveFlash(`Monitoring ended for ${existing.alias}.`);
    go({ screen: 'board' });
  };

  return (
    <section aria-labelledby="stay-title">
      <h1 id="stay-title">{existing ? `${bed.label}: patient details` : `${bed.label}: start monitoring`}</h1>
      <form
        class="stay-form"
        onSubmit={(e) => {
          e.preventDefault();
          void save();
        }}
      >
        <label class="field">
          Initials or alias (never the full name)
          <input required maxLength={40} value={form.alias} onInput={(e) => set('alias', e.currentTarget.value)} />
        </label>
        <label class="field">
          Record number (optional)
          <input maxLength={40} value={form.recordNumber} onInput={(e) => set('recordNumber', e.currentTarget.value)} />
        </label>
        <fieldset class="inline-choices">
          <legend>Sex (QTc limits differ)</legend>
          {(['female', 'male', 'unknown'] as const).map((s) => (
            <label key={s} class="radio">
              <input type="radio" name="sex" checked={form.sex === s} onChange={() => set('sex', s)} />
              {s === 'unknown' ? 'Not recorded' : s === 'female' ? 'Female' : 'Male'}
            </label>
          ))}
        </fieldset>
        <fieldset class="inline-choices">
          <legend>Age band</legend>
          {ageBands.map((a) => (
            <label key={a} class="radio">
              <input type="radio" name="age" checked={form.ageBand === a} onChange={() => set('ageBand', a)} />
              {a}
            </label>
          ))}
        </fieldset>
        <label class="check">
          <input type="checkbox" checked={form.paced} onChange={(e) => set('paced', e.currentTarget.checked)} />
          Paced
        </label>
        <label class="check">
          <input type="checkbox" checked={form.bundleBranchBlock} onChange={(e) => set('bundleBranchBlock', e.currentTarget.checked)} />
          Known bundle-branch block
        </label>
        <label class="field">
          QT-prolonging drugs (optional)
          <input maxLength={300} value={form.qtProlongingDrugs} onInput={(e) => set('qtProlongingDrugs', e.currentTarget.value)} />
        </label>
        <label class="field">
          Baseline QTc in ms (optional, 200 to 800)
          <input inputMode="numeric" value={form.baselineQtcMs} onInput={(e) => set('baselineQtcMs', e.currentTarget.value)} />
        </label>
        <label class="field">
          Notes
          <textarea rows={3} maxLength={2000} value={form.notes} onInput={(e) => set('notes', e.currentTarget.value)} />
        </label>
        <FormErrors messages={errors} />
        <div class="actions">
          <button type="submit" class="button button-primary">
            {existing ? 'Save details' : 'Start monitoring'}
          </button>
          <a class="button" href={hrefOf(existing ? { screen: 'bed', bedId } : { screen: 'board' })}>
            Cancel
          </a>
          {existing ? (
            <button type="button" class="button button-quiet" onClick={() => void end()}>
              End monitoring
            </button>
          ) : null}
        </div>
      </form>
    </section>
  );
}
