import type { ReadReason } from '../../core/records.ts';
import { readReasonNames, readReasons } from '../../core/records.ts';
import type { ReadDraftForm } from '../../store/read-draft.ts';

/** Why this read: big buttons for the reasons, details when "Other", then notes. */
export function ReasonFields({ form, setForm, reasonTextError }: { form: ReadDraftForm; setForm: (u: (f: ReadDraftForm) => ReadDraftForm) => void; reasonTextError: string | null }) {
  return (
    <fieldset class="form-block">
      <legend>Reason and notes</legend>
      <div class="segmented wrap" role="radiogroup" aria-label="Reason for this read">
        {readReasons.map((r: ReadReason) => (
          <button key={r} type="button" role="radio" aria-checked={form.reason === r} class={`segment${form.reason === r ? ' on' : ''}`} onClick={() => setForm((f) => ({ ...f, reason: r }))}>
            {readReasonNames[r]}
          </button>
        ))}
      </div>
      {form.reason !== 'routine' ? (
        <label class="field">
          Reason details{form.reason === 'other' ? ' (required)' : ' (optional)'}
          <input value={form.reasonText} maxLength={300} aria-invalid={reasonTextError ? 'true' : 'false'} onInput={(e) => setForm((f) => ({ ...f, reasonText: e.currentTarget.value }))} />
        </label>
      ) : null}
      {reasonTextError ? (
        <p class="field-error" role="alert">
          {reasonTextError}
        </p>
      ) : null}
      <label class="field">
        Notes
        <textarea rows={3} maxLength={2000} value={form.notes} onInput={(e) => setForm((f) => ({ ...f, notes: e.currentTarget.value }))} />
      </label>
    </fieldset>
  );
}
