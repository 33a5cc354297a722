import type { RhythmQuestion } from '../../core/rhythm-questions.ts';
import type { RhythmLabelId } from '../../core/rhythm-labels.ts';
import { rhythmLabels } from '../../core/rhythm-labels.ts';
import type { ReadDraftForm } from '../../store/read-draft.ts';

/** The rhythm picked from the core's list, with the core's cross-check questions, AV block, free text and ectopy. */
export function RhythmFields({ form, setForm, questions }: { form: ReadDraftForm; setForm: (u: (f: ReadDraftForm) => ReadDraftForm) => void; questions: readonly RhythmQuestion[] }) {
  return (
    <fieldset class="form-block">
      <legend>Rhythm</legend>
      <label class="field">
        Rhythm on the strip
        <select value={form.rhythmLabel} onChange={(e) => setForm((f) => ({ ...f, rhythmLabel: e.currentTarget.value as RhythmLabelId | '' }))}>
          <option value="">Choose the rhythm…</option>
          {rhythmLabels.map((l) => (
            <option key={l.id} value={l.id}>
              {l.name}
            </option>
          ))}
        </select>
      </label>
      {questions.length > 0 ? (
        <ul class="questions" aria-label="Questions about the rhythm" aria-live="polite">
          {questions.map((q) => (
            <li key={q.code}>
              <strong>Check: </strong>
              {q.question}
            </li>
          ))}
        </ul>
      ) : null}
      <label class="check">
        <input type="checkbox" checked={form.avBlockNoted} onChange={(e) => setForm((f) => ({ ...f, avBlockNoted: e.currentTarget.checked }))} />
        AV block noted on the strip
      </label>
      <label class="field">
        Rhythm in your words (optional)
        <input value={form.rhythmText} maxLength={200} onInput={(e) => setForm((f) => ({ ...f, rhythmText: e.currentTarget.value }))} />
      </label>
      <label class="field">
        Ectopy (optional, e.g. "occasional PVCs")
        <input value={form.ectopy} maxLength={200} onInput={(e) => setForm((f) => ({ ...f, ectopy: e.currentTarget.value }))} />
      </label>
    </fieldset>
  );
}
