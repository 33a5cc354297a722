import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Bed } from '../../core/records.ts';
import type { RhythmDb } from '../../store/db.ts';
import { saveBed } from '../../store/unit-setup.ts';
import { uuidV7 } from '../../store/uuid-v7.ts';
import { FormErrors } from '../components/FormErrors.tsx';

/** The ward's beds: rename, take out of use, add. */
export function BedsEditor({ db, unitId, beds, canEdit }: { db: RhythmDb; unitId: string; beds: Bed[]; canEdit: boolean }) {
  const [newLabel, setNewLabel] = useState('');
  const [errors, setErrors] = useState<string[]>([]);
  const sorted = [...beds].sort((a, b) => a.sortOrder - b.sortOrder);
  const run = async (bed: Bed) => {
    setErrors([]);
    try {
      await saveBed(db, bed, Date.now());
      return true;
    } catch (error) {
      setErrors(error instanceof ValidationError ? error.errors.map((e) => e.message) : ['Could not save the bed; try again.']);
      return false;
    }
  };
  return (
    <fieldset disabled={!canEdit}>
      <legend>Beds</legend>
      <ul class="plain-list">
        {sorted.map((bed) => (
          <li key={bed.id} class="bed-edit">
            <label class="field">
              Label
              <input
                value={bed.label}
                onChange={(e) => {
                  const label = e.currentTarget.value.trim();
                  if (label && label !== bed.label) void run({ ...bed, label });
                }}
              />
            </label>
            <label class="check">
              <input type="checkbox" checked={bed.active} onChange={(e) => void run({ ...bed, active: e.currentTarget.checked })} />
              In use
            </label>
          </li>
        ))}
      </ul>
      <form
        class="inline-fields"
        onSubmit={(e) => {
          e.preventDefault();
          const nowMs = Date.now();
          void run({ id: `bed-${uuidV7(nowMs)}`, unitId, label: newLabel.trim(), sortOrder: sorted.length, active: true }).then((ok) => ok && setNewLabel(''));
        }}
      >
        <label class="field">
          New bed label
          <input value={newLabel} onInput={(e) => setNewLabel(e.currentTarget.value)} />
        </label>
        <button type="submit" class="button">
          Add bed
        </button>
      </form>
      <FormErrors messages={errors} />
    </fieldset>
  );
}
