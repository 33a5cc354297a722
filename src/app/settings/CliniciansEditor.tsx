import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import { addClinician, listClinicians } from '../../store/clinicians.ts';
import type { ClinicianRole, RhythmDb } from '../../store/db.ts';
import { FormErrors } from '../components/FormErrors.tsx';
import { useLiveQuery } from '../use-live-query.ts';

const roleWords: Record<ClinicianRole, string> = { nurse: 'Nurse', 'charge-nurse': 'Charge nurse', 'unit-admin': 'Unit admin' };

/** Clinicians who may chart on this tablet (until accounts come from the unit server). */
export function CliniciansEditor({ db, canEdit }: { db: RhythmDb; canEdit: boolean }) {
  const clinicians = useLiveQuery(() => listClinicians(db), [db]) ?? [];
  const [name, setName] = useState('');
  const [role, setRole] = useState<ClinicianRole>('nurse');
  const [pin, setPin] = useState('');
  const [errors, setErrors] = useState<string[]>([]);
  return (
    <section aria-labelledby="clinicians-title">
      <h2 id="clinicians-title">Clinicians on this tablet</h2>
      <ul>
        {clinicians.map((c) => (
          <li key={c.id}>
            {c.name} · {roleWords[c.role]}
          </li>
        ))}
      </ul>
      {canEdit ? (
        <form
          class="inline-fields"
          onSubmit={(e) => {
            e.preventDefault();
            setErrors([]);
            addClinician(db, { name, role, pin }, Date.now())
              .then(() => {
                setName('');
                setPin('');
              })
              .catch((error: unknown) => setErrors(error instanceof ValidationError ? error.errors.map((x) => x.message) : ['Could not add; try again.']));
          }}
        >
          <label class="field">
            Name
            <input value={name} onInput={(e) => setName(e.currentTarget.value)} />
          </label>
          <label class="field">
            Role
            <select value={role} onChange={(e) => setRole(e.currentTarget.value as ClinicianRole)}>
              {(Object.keys(roleWords) as ClinicianRole[]).map((r) => (
                <option key={r} value={r}>
                  {roleWords[r]}
                </option>
              ))}
            </select>
          </label>
          <label class="field">
            Their PIN (4 to 8 digits)
            <input type="password" inputMode="numeric" autoComplete="new-password" value={pin} onInput={(e) => setPin(e.currentTarget.value)} />
          </label>
          <button type="submit" class="button">
            Add clinician
          </button>
        </form>
      ) : null}
      <FormErrors messages={errors} />
    </section>
  );
}
