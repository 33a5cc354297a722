import type { ReadDraftForm } from '../../store/read-draft.ts';

/** The strip's date and time as printed on it, on the ward clock. */
export function StripTimeFields({ form, setForm, error }: { form: ReadDraftForm; setForm: (u: (f: ReadDraftForm) => ReadDraftForm) => void; error: string | null }) {
  return (
    <fieldset class="form-block">
      <legend>Strip time (ward clock)</legend>
      <div class="inline-fields">
        <label class="field">
          Date
          <input type="date" value={form.stripLocalDate} onInput={(e) => setForm((f) => ({ ...f, stripLocalDate: e.currentTarget.value }))} />
        </label>
        <label class="field">
          Time
          <input type="time" value={form.stripLocalTime} onInput={(e) => setForm((f) => ({ ...f, stripLocalTime: e.currentTarget.value }))} />
        </label>
      </div>
      {error ? (
        <p class="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
