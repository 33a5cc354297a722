import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Bed, Unit } from '../../core/records.ts';
import { addClinician, pinPattern } from '../../store/clinicians.ts';
import type { RhythmDb } from '../../store/db.ts';
import type { SyncEngine } from '../../sync/sync-engine.ts';
import { loadDemoWard } from '../../store/load-demo-ward.ts';
import { StorageFullError } from '../../store/storage-full.ts';
import { saveUnitSetup } from '../../store/unit-setup.ts';
import { uuidV7 } from '../../store/uuid-v7.ts';
import { DecisionSupportNote } from '../components/DecisionSupportNote.tsx';
import { FormErrors } from '../components/FormErrors.tsx';
import { ServerConnect } from '../components/ServerConnect.tsx';
import { shiftPresets } from '../shift-presets.ts';

const tabletTimeZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';

/** A new tablet: set up the ward and its first clinician in three steps, or load the invented demo ward. */
export function FirstRun({ db, sync }: { db: RhythmDb; sync?: SyncEngine }) {
  const [step, setStep] = useState<0 | 1 | 2 | 3>(0);
  const [unitName, setUnitName] = useState('');
  const [timeZone, setTimeZone] = useState(tabletTimeZone());
  const [presetId, setPresetId] = useState(shiftPresets[0]!.id);
  const [intervalHours, setIntervalHours] = useState('4');
  const [bedLabels, setBedLabels] = useState(Array.from({ length: 12 }, (_, i) => `Bed ${i + 1}`).join('\n'));
  const [adminName, setAdminName] = useState('');
  const [pin, setPin] = useState('');
  const [errors, setErrors] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);

  const fail = (error: unknown) => {
    if (error instanceof ValidationError) setErrors(error.errors.map((e) => e.message));
    else if (error instanceof StorageFullError) setErrors([error.message]);
    else setErrors(['Something went wrong while saving; nothing was lost. Try again.']);
  };

  const loadDemo = async () => {
    setBusy(true);
    try {
      await loadDemoWard(db, Date.now());
    } catch (error) {
      fail(error);
      setBusy(false);
    }
  };

  const finish = async () => {
    setBusy(true);
    setErrors([]);
    const nowMs = Date.now();
    const unitId = `unit-${uuidV7(nowMs)}`;
    const unit: Unit = {
      id: unitId,
      name: unitName.trim(),
      timeZone: timeZone.trim(),
      shiftPattern: { shifts: shiftPresets.find((p) => p.id === presetId)!.shifts },
      readIntervalHours: Number(intervalHours),
      defaultPaperSpeedMmPerS: 25,
      defaultGainMmPerMv: 10,
      idleLockMinutes: 5,
      policyOverrides: [],
      updatedAtMs: nowMs,
    };
    const labels = bedLabels.split('\n').map((l) => l.trim()).filter(Boolean);
    const beds: Bed[] = labels.map((label, i) => ({ id: `bed-${uuidV7(nowMs + i)}`, unitId, label, sortOrder: i, active: true }));
    try {
      if (labels.length === 0) throw new ValidationError([{ field: 'beds', message: 'Beds: list at least one bed label.' }]);
      // The PIN is checked before the unit is saved: the lock screen appears as soon as the unit exists.
      if (!pinPattern.test(pin)) throw new ValidationError([{ field: 'pin', message: 'PIN: choose 4 to 8 digits.' }]);
      if (adminName.trim().length < 2) throw new ValidationError([{ field: 'name', message: 'Name: type the name the team knows you by.' }]);
      await saveUnitSetup(db, { unit, beds }, nowMs);
      await addClinician(db, { name: adminName, role: 'unit-admin', pin }, nowMs);
    } catch (error) {
      fail(error);
      setBusy(false);
    }
  };

  return (
    <main class="first-run">
      <h1>Rhythm Ledger</h1>
      <p class="lead">Rhythm-strip reads for the ward: box counts in, rate, intervals and QTc out, the q4h schedule and handover.</p>
      <DecisionSupportNote />
      {step === 0 ? (
        <div class="choice-grid">
          <section class="choice">
            <h2>Set up this ward</h2>
            <p>Three short steps: the ward, its beds, and you as the first clinician.</p>
            <button type="button" class="button button-primary" onClick={() => setStep(1)}>
              Set up this ward
            </button>
          </section>
          {sync ? (
            <section class="choice">
              <h2>Join a ward on the unit server</h2>
              <p>Sign in with your unit account; the ward, its beds and its clinicians come from the server.</p>
              <ServerConnect db={db} sync={sync} />
            </section>
          ) : null}
          <section class="choice">
            <h2>Try the demo ward</h2>
            <p>An invented hospital and ward (Harbourside General, Ward 7 North) with made-up patients by initials, and a few days of reads. Nothing is sent to a server.</p>
            <button type="button" class="button" disabled={busy} onClick={() => void loadDemo()}>
              {busy ? 'Loading…' : 'Load the demo ward'}
            </button>
          </section>
        </div>
      ) : null}
      {step > 0 ? (
        <form
          class="setup-form"
          onSubmit={(e) => {
            e.preventDefault();
            if (step < 3) setStep((step + 1) as 2 | 3);
            else void finish();
          }}
        >
          <p class="step-count">Step {step} of 3</p>
          {step === 1 ? (
            <fieldset>
              <legend>The ward</legend>
              <label>
                Ward name
                <input required value={unitName} onInput={(e) => setUnitName(e.currentTarget.value)} placeholder="e.g. Ward 5 telemetry" />
              </label>
              <label>
                Time zone (the ward clock)
                <input required value={timeZone} onInput={(e) => setTimeZone(e.currentTarget.value)} />
              </label>
              <fieldset class="inline-choices">
                <legend>Shift pattern</legend>
                {shiftPresets.map((p) => (
                  <label key={p.id} class="radio">
                    <input type="radio" name="preset" checked={presetId === p.id} onChange={() => setPresetId(p.id)} />
                    {p.name}
                  </label>
                ))}
              </fieldset>
              <label>
                Read interval (hours)
                <input type="number" min={1} max={12} required value={intervalHours} onInput={(e) => setIntervalHours(e.currentTarget.value)} />
              </label>
            </fieldset>
          ) : null}
          {step === 2 ? (
            <fieldset>
              <legend>Beds</legend>
              <label>
                Bed labels, one per line
                <textarea rows={12} value={bedLabels} onInput={(e) => setBedLabels(e.currentTarget.value)} />
              </label>
            </fieldset>
          ) : null}
          {step === 3 ? (
            <fieldset>
              <legend>You, the first clinician (unit admin)</legend>
              <label>
                Your name as the team knows it
                <input required value={adminName} onInput={(e) => setAdminName(e.currentTarget.value)} autoComplete="name" />
              </label>
              <label>
                Choose a PIN (4 to 8 digits)
                <input type="password" inputMode="numeric" required value={pin} onInput={(e) => setPin(e.currentTarget.value)} autoComplete="new-password" />
              </label>
            </fieldset>
          ) : null}
          <FormErrors messages={errors} />
          <div class="actions">
            <button type="button" class="button" onClick={() => setStep((step - 1) as 0 | 1 | 2)}>
              Back
            </button>
            <button type="submit" class="button button-primary" disabled={busy}>
              {step < 3 ? 'Next' : busy ? 'Saving…' : 'Finish set-up'}
            </button>
          </div>
        </form>
      ) : null}
    </main>
  );
}
