import { useState } from 'preact/hooks';
import type { RhythmDb } from '../../store/db.ts';
import type { ServerConnection } from '../server-call.ts';
import { saveServerAccount } from '../server-accounts.ts';
import { enrollDevice, enrolmentStillKnown, signIn } from '../server-session.ts';
import type { ServerUser } from '../sync-protocol.ts';

/** Props of the server sign-in: the tablet's database, how to reach the server, and what to do once done. */
export interface ServerSignInProps {
  db: RhythmDb;
  connection: ServerConnection;
  now?: () => number;
  /** Called once the account can unlock this tablet offline. */
  onDone: (user: ServerUser) => void;
  /** PBKDF2 iterations for the PIN (tests pass a small number). */
  pinIterations?: number;
}

type Step = { name: 'credentials' } | { name: 'enrol'; user: ServerUser } | { name: 'pin'; user: ServerUser; enrolled: boolean };

const messageOf = (error: unknown) => (error instanceof Error ? error.message : 'Something went wrong; try again.');

/**
 * Signs a clinician in to the unit server, enrols the tablet when a unit admin signs in on a new
 * one, then asks for a PIN so the same clinician can unlock this tablet offline later.
 */
export function ServerSignIn({ db, connection, now = Date.now, onDone, pinIterations }: ServerSignInProps) {
  const [step, setStep] = useState<Step>({ name: 'credentials' });
  const [username, setUsername] = useState('');
  const [password, setPassword] = useState('');
  const [label, setLabel] = useState('');
  const [pin, setPin] = useState('');
  const [pinRepeat, setPinRepeat] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const act = async (work: () => Promise<void>) => {
    setBusy(true);
    setError(null);
    try {
      await work();
    } catch (thrown) {
      setError(messageOf(thrown));
    } finally {
      setBusy(false);
    }
  };

  const submitCredentials = (event: Event) => {
    event.preventDefault();
    void act(async () => {
      const answer = await signIn(db, connection, { username, password }, now());
      setPassword('');
      // A tablet whose enrolment the server no longer knows (withdrawn, or lost in a restore) is enrolled again.
      const enrolled = await enrolmentStillKnown(db, connection);
      setStep(!enrolled && answer.user.role === 'unit-admin' ? { name: 'enrol', user: answer.user } : { name: 'pin', user: answer.user, enrolled });
    });
  };

  const submitEnrol = (event: Event, user: ServerUser) => {
    event.preventDefault();
    void act(async () => {
      await enrollDevice(db, connection, label);
      setStep({ name: 'pin', user, enrolled: true });
    });
  };

  const submitPin = (event: Event, user: ServerUser) => {
    event.preventDefault();
    void act(async () => {
      await saveServerAccount(db, { user, pin, pinRepeat, ...(pinIterations ? { iterations: pinIterations } : {}) }, now());
      setPin('');
      setPinRepeat('');
      onDone(user);
    });
  };

  const problem = error ? (
    <p class="form-error" role="alert">
      {error}
    </p>
  ) : null;

  if (step.name === 'enrol') {
    const user = step.user;
    return (
      <form class="server-sign-in" onSubmit={(e) => submitEnrol(e, user)}>
        <h2>Enrol this tablet</h2>
        <p>This tablet is not yet known to the unit server. Name it so you can tell it apart later.</p>
        <label>
          Tablet name
          <input name="label" value={label} onInput={(e) => setLabel(e.currentTarget.value)} required />
        </label>
        {problem}
        <button type="submit" class="button" disabled={busy}>
          Enrol tablet
        </button>
      </form>
    );
  }
  if (step.name === 'pin') {
    const user = step.user;
    return (
      <form class="server-sign-in" onSubmit={(e) => submitPin(e, user)}>
        <h2>Choose a PIN for this tablet</h2>
        <p>Signed in as {user.name}. With this PIN you can unlock this tablet when the network is down. 4 to 8 digits.</p>
        {step.enrolled ? null : (
          <p class="form-note" role="note">
            This tablet is not enrolled with the unit server yet: reads are kept on it and sent once a unit admin signs in here and enrols it.
          </p>
        )}
        <label>
          PIN
          <input name="pin" type="password" inputMode="numeric" autocomplete="new-password" value={pin} onInput={(e) => setPin(e.currentTarget.value)} required />
        </label>
        <label>
          PIN again
          <input name="pinRepeat" type="password" inputMode="numeric" autocomplete="new-password" value={pinRepeat} onInput={(e) => setPinRepeat(e.currentTarget.value)} required />
        </label>
        {problem}
        <button type="submit" class="button" disabled={busy}>
          Save PIN
        </button>
      </form>
    );
  }
  return (
    <form class="server-sign-in" onSubmit={submitCredentials}>
      <h2>Sign in to the unit server</h2>
      <label>
        Username
        <input name="username" autocomplete="username" value={username} onInput={(e) => setUsername(e.currentTarget.value)} required />
      </label>
      <label>
        Password
        <input name="password" type="password" autocomplete="current-password" value={password} onInput={(e) => setPassword(e.currentTarget.value)} required />
      </label>
      {problem}
      <button type="submit" class="button" disabled={busy}>
        Sign in
      </button>
    </form>
  );
}
