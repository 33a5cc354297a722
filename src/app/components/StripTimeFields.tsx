import type { ReadDraftForm } from '../../store/read-draft.ts';
import { useCharting } from '../app-context.ts';
import { stripTimeOf } from '../read-form-values.ts';
import { dayClockText } from '../time-text.ts';

/** The strip's date and time as printed on it, on the ward clock. */
export function StripTimeFields({ form, setForm, error }: { form: ReadDraftForm; setForm: (u: (f: ReadDraftForm) => ReadDraftForm) => void; error: string | null }) {
  // The date and time pickers follow the tablet's language (12/01 and 05:34 PM on a US-English
  // tablet); the strip time is echoed as the rest of the app writes times, so it cannot be misread.
  const { unit } = useCharting();
  const strip = stripTimeOf(form, unit.timeZone);
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
      {strip.ok ? <p class="hint strip-time-words">Strip time: {dayClockText(strip.ms, unit.timeZone)} (24-hour ward clock)</p> : null}
      {error ? (
        <p class="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}
