import { useState } from 'preact/hooks';
import { ValidationError } from '../../../core/field-error.ts';
import { listClinicians, verifyPin } from '../../../store/clinicians.ts';
import type { ClinicianRow, StoredHandover } from '../../../store/db.ts';
import { acknowledgeHandover } from '../../../store/handovers.ts';
import { useCharting } from '../../app-context.ts';
import { useLiveQuery } from '../../use-live-query.ts';

const messageOf = (error: unknown) => (error instanceof ValidationError ? error.errors.map((e) => e.message).join(' ') : error instanceof Error ? error.message : 'Could not save; try again.');

/**
 * The receiving nurse acknowledges a written handover: the clinician charting on this tablet with one
 * tap, or another clinician of this tablet with their PIN. The giver never appears as a receiver.
 */
export function ReceiveHandoverForm({ handover }: { handover: StoredHandover }) {
  const { db, clinician } = useCharting();
  const clinicians = useLiveQuery(() => listClinicians(db), [db]);
  const [chosen, setChosen] = useState<ClinicianRow | null>(null);
  const [pin, setPin] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (handover.receivedById !== undefined) return null;

  const receive = async (receiver: { id: string; name: string }) => {
    setBusy(true);
    setError(null);
    try {
      await acknowledgeHandover(db, { handoverId: handover.id, receiver, nowMs: Date.now() });
      setChosen(null);
    } catch (e) {
      setError(messageOf(e));
    } finally {
      setBusy(false);
    }
  };
  const confirmWithPin = async (event: Event) => {
    event.preventDefault();
    if (!chosen) return;
    const row = await verifyPin(db, chosen.id, pin);
    setPin('');
    if (!row) {
      setError(`That PIN does not match ${chosen.name}.`);
      return;
    }
    await receive({ id: row.id, name: row.name });
  };

  const meIsGiver = clinician.id === handover.givenById;
  const others = (clinicians ?? []).filter((c) => c.id !== handover.givenById && c.id !== clinician.id);
  return (
    <div class="receive-form" role="group" aria-label="Receive this handover">
      <p class="receive-lead">
        Given by <strong>{handover.givenByName}</strong>. The nurse taking over the patient acknowledges it here; it cannot be the nurse who gave it.
      </p>
      {meIsGiver ? null : (
        <button type="button" class="button button-primary" disabled={busy} onClick={() => void receive({ id: clinician.id, name: clinician.name })}>
          Received by me, {clinician.name}
        </button>
      )}
      {others.length > 0 ? (
        <>
          <p class="receive-other">{meIsGiver ? 'Receiving nurse, pick your name:' : 'Or another nurse on this tablet:'}</p>
          <ul class="clinician-list" aria-label="Receiving nurse">
            {others.map((c) => (
              <li key={c.id}>
                <button type="button" class={`clinician${chosen?.id === c.id ? ' chosen' : ''}`} aria-pressed={chosen?.id === c.id} onClick={() => setChosen(c)}>
                  {c.name}
                </button>
              </li>
            ))}
          </ul>
        </>
      ) : meIsGiver ? (
        <p class="hint">No other clinician is set up on this tablet: the receiving nurse signs in on this tablet (or acknowledges on their own).</p>
      ) : null}
      {chosen ? (
        <form class="pin-form" onSubmit={(e) => void confirmWithPin(e)}>
          <label>
            PIN for {chosen.name}
            <input type="password" inputMode="numeric" autoComplete="off" value={pin} onInput={(e) => setPin(e.currentTarget.value)} />
          </label>
          <button type="submit" class="button button-primary" disabled={busy || pin.length < 4}>
            Confirm received by {chosen.name}
          </button>
        </form>
      ) : null}
      {error ? (
        <p class="form-errors" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}
