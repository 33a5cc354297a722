import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Unit } from '../../core/records.ts';
import { addClinician, listClinicians, verifyPin } from '../../store/clinicians.ts';
import type { ClinicianRow, RhythmDb } from '../../store/db.ts';
import { demoClinicians } from '../../store/demo-ward.ts';
import type { ServerConnection } from '../../sync/server-call.ts';
import type { SyncEngine } from '../../sync/sync-engine.ts';
import { ServerSignIn } from '../../sync/ui/ServerSignIn.tsx';
import { FormErrors } from '../components/FormErrors.tsx';
import { useLiveQuery } from '../use-live-query.ts';

/** Wrong PINs allowed before a wait, and how long the wait is: slows guessing at the screen. */
const triesBeforeWait = 5;
const waitAfterTriesMs = 30_000;

/** How the lock screen reaches the unit server; given only to a tablet enrolled with one. */
export interface LockScreenServer {
  connection: ServerConnection;
  sync: SyncEngine;
  /** PBKDF2 iterations for the PIN chosen after signing in (tests pass a small number). */
  pinIterations?: number;
}

/**
 * The locked screen: no patient data, only "who is charting?" and a PIN. On a tablet enrolled with
 * a unit server it also lets a clinician new to this tablet sign in with their unit account and
 * choose a PIN, so nobody has to wait for a charge nurse to connect them from the unit settings.
 */
export function LockScreen({ db, unit, demoWard, onUnlock, server = null }: { db: RhythmDb; unit: Unit; demoWard: boolean; onUnlock: (c: ClinicianRow) => void; server?: LockScreenServer | null }) {
  const clinicians = useLiveQuery(() => listClinicians(db), [db]);
  const [signingIn, setSigningIn] = useState(false);
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
  if (clinicians.length === 0 && !server) return <FirstClinician db={db} />;

  if (server && signingIn) {
    return (
      <main class="lock">
        <h1>Sign in with your unit account</h1>
        <p class="lock-unit">{unit.name}</p>
        <p class="lock-note">Patient details stay hidden until you have chosen a PIN for this tablet.</p>
        <ServerSignIn
          db={db}
          connection={server.connection}
          {...(server.pinIterations ? { pinIterations: server.pinIterations } : {})}
          onDone={(user) => {
            // The session just opened is this clinician's: the tablet sends and fetches under it from now on.
            void server.sync.refresh().then(() => server.sync.syncNow());
            void db.clinicians.get(user.id).then((row) => {
              if (row) onUnlock(row);
            });
          }}
        />
        <div class="actions">
          <button type="button" class="button button-quiet" onClick={() => setSigningIn(false)}>
            Back to the clinicians on this tablet
          </button>
        </div>
      </main>
    );
  }

  return (
    <main class="lock">
      <h1>Who is charting?</h1>
      <p class="lock-unit">{unit.name}</p>
      <p class="lock-note">Patient details are hidden while the screen is locked. Drafts belong to the nurse who typed them.</p>
      {clinicians.length === 0 ? (
        <p>Nobody can unlock this tablet with a PIN yet.</p>
      ) : (
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
      )}
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
      {server ? (
        <section class="lock-online" aria-labelledby="lock-online-title">
          <h2 id="lock-online-title">Not on this list, or forgot your PIN?</h2>
          <p>Sign in with the username and password of your unit account, then choose a PIN to unlock this tablet when the network is down.</p>
          <button
            type="button"
            class="button"
            onClick={() => {
              setChosen(null);
              setPin('');
              setMessage(null);
              setSigningIn(true);
            }}
          >
            Sign in with your unit account
          </button>
        </section>
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
      <FormErrors messages={errors} />
    </main>
  );
}
