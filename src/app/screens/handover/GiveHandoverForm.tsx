import { useState } from 'preact/hooks';
import { ValidationError } from '../../../core/field-error.ts';
import type { HandoverSummary } from '../../../core/handover-summary.ts';
import type { StoredHandover } from '../../../store/db.ts';
import { saveHandover } from '../../../store/handovers.ts';
import { useCharting } from '../../app-context.ts';

const messageOf = (error: unknown) => (error instanceof ValidationError ? error.errors.map((e) => e.message).join(' ') : error instanceof Error ? error.message : 'Could not save; try again.');

/**
 * The giving nurse's part: their own words beside the generated summary, then "Hand over". The same
 * nurse may give it again (after a late read) until someone has received it.
 */
export function GiveHandoverForm({ summary, existing }: { summary: HandoverSummary; existing: StoredHandover | null }) {
  const { db, unit, clinician } = useCharting();
  const again = existing !== null;
  const [text, setText] = useState(existing?.nurseText ?? '');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (existing && (existing.receivedById !== undefined || existing.givenById !== clinician.id)) return null;
  const submit = (event: Event) => {
    event.preventDefault();
    setBusy(true);
    setError(null);
    saveHandover(db, { unitId: unit.id, summary, nurseText: text, giver: { id: clinician.id, name: clinician.name }, nowMs: Date.now(), ...(existing ? { replacesId: existing.id } : {}) })
      .catch((e: unknown) => setError(messageOf(e)))
      .finally(() => setBusy(false));
  };
  return (
    <form class="give-form" onSubmit={submit}>
      <label class="field">
        {again ? 'Your handover text (you may change it until it is received)' : 'Your own words for the receiving nurse (optional): what the summary cannot know'}
        <textarea value={text} maxLength={4000} onInput={(e) => setText(e.currentTarget.value)} />
      </label>
      <p class="hint">The generated summary is kept with the handover as written now; reads added or amended later show as changes.</p>
      <button type="submit" class="button button-primary" disabled={busy}>
        {again ? `Hand over again as ${clinician.name}` : `Hand over as ${clinician.name}`}
      </button>
      {error ? (
        <p class="form-errors" role="alert">
          {error}
        </p>
      ) : null}
    </form>
  );
}
