import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Unit } from '../../core/records.ts';
import { addClinician, listClinicians, verifyPin } from '../../store/clinicians.ts';
import type { ClinicianRow, RhythmDb } from '../../store/db.ts';
import { demoClinicians } from '../../store/demo-ward.ts';
import { useLiveQuery } from '../use-live-query.ts';

/** Wrong PINs allowed before a wait, and how long the wait is: slows guessing at the screen. */
const triesBeforeWait = 5;
const waitAfterTriesMs = 30_000;

/** The locked screen: no patient data, only "who is charting?" and a PIN. */
export function LockScreen({ db, unit, demoWard, onUnlock }: { db: RhythmDb; unit: Unit; demoWard: boolean; onUnlock: (c: ClinicianRow) => void }) {
  const clinicians = useLiveQuery(() => listClinicians(db), [db]);
  const [chosen, setChosen] = useState<ClinicianRow | null>(null);
  const [pin, setPin] = useState('');
  const [message, setMessage] = useState<string | null>(null);
  const [wrongTries, setWrongTries] = useState(0);
  const [waitUntilMs, setWaitUntilMs] = useState(0);
  const [busy, setBusy] = useState(false);

  const unlock = async () => {
    if (!chosen) return;
    if (Date.now() < waitUntilMs) {
      setMessage(`Too many wrong PINs: wait ${Math.ceil((waitUntilMs - Date.now()) / 1000)} seconds.`);
      return;
    }
    setBusy(true);
    const row = await verifyPin(db, chosen.id, pin);
    setBusy(false);
    setPin('');
    if (row) {
      onUnlock(row);
      return;
    }
    const tries = wrongTries + 1;
    setWrongTries(tries);
    if (tries % triesBeforeWait === 0) {
      setWaitUntilMs(Date.now() + waitAfterTriesMs);
      setMessage('That PIN does not match. Too many wrong PINs: wait 30 seconds.');
    } else {
      setMessage(`That PIN does not match. ${triesBeforeWait - (tries % triesBeforeWait)} tries before a 30-second wait.`);
    }
  };

  if (clinicians === undefined) return <p class="loading">Opening…</p>;
  if (clinicians.length === 0) return <FirstClinician db={db} />;

  return (
    <main class="lock">
      <h1>Who is charting?</h1>
      <p class="lock-unit">{unit.name}</p>
      <p class="lock-note">Patient details are hidden while the screen is locked. Drafts belong to the nurse who typed them.</p>
      <ul class="clinician-list" aria-label="Clinicians on this tablet">
        {clinicians.map((c) => (
          <li key={c.id}>
            <button
              type="button"
              class={`clinician${chosen?.id === c.id ? ' chosen' : ''}`}
              aria-pressed={chosen?.id === c.id}
              onClick={() => {
                setChosen(c);
                setMessage(null);
              }}
            >
              {c.name}
            </button>
          </li>
        ))}
      </ul>
      {chosen ? (
        <form
          class="pin-form"
          onSubmit={(e) => {
            e.preventDefault();
            void unlock();
          }}
        >
          <label>
            PIN for {chosen.name}
            <input type="password" inputMode="numeric" autoComplete="off" autoFocus value={pin} onInput={(e) => setPin(e.currentTarget.value)} />
          </label>
          <button type="submit" class="button button-primary" disabled={busy || pin.length < 4}>
            {busy ? 'Checking…' : 'Unlock'}
          </button>
        </form>
      ) : null}
      {message ? (
        <p class="form-errors" role="alert">
          {message}
        </p>
      ) : null}
      {demoWard ? (
        <p class="demo-pins">
          Demo PINs: {demoClinicians.map((c) => `${c.name} ${c.pin}`).join(' · ')}
        </p>
      ) : null}
    </main>
  );
}

/** A unit with no clinician yet (set-up interrupted): the first one is added here. */
function FirstClinician({ db }: { db: RhythmDb }) {
  const [name, setName] = useState('');
  const [pin, setPin] = useState('');
  const [errors, setErrors] = useState<string[]>([]);
  return (
    <main class="lock">
      <h1>Add the first clinician</h1>
      <form
        class="pin-form"
        onSubmit={(e) => {
          e.preventDefault();
          addClinician(db, { name, role: 'unit-admin', pin }, Date.now()).catch((error: unknown) =>
            setErrors(error instanceof ValidationError ? error.errors.map((x) => x.message) : ['Could not save; try again.']),
          );
        }}
      >
        <label>
          Your name
          <input value={name} onInput={(e) => setName(e.currentTarget.value)} />
        </label>
        <label>
          PIN (4 to 8 digits)
          <input type="password" inputMode="numeric" value={pin} onInput={(e) => setPin(e.currentTarget.value)} />
        </label>
        <button type="submit" class="button button-primary">
          Add and continue
        </button>
      </form>
      {errors.length > 0 ? (
        <ul class="form-errors" role="alert">
          {errors.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      ) : null}
    </main>
  );
}
