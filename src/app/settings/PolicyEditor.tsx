import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { QtcFormula } from '../../core/qtc.ts';
import { qtcFormulaNames, qtcFormulas } from '../../core/qtc.ts';
import type { Unit } from '../../core/records.ts';
import type { Severity, ThresholdKey, UnitPolicy } from '../../core/unit-policy.ts';
import { thresholdComparators, thresholdKeys, thresholdLabels } from '../../core/unit-policy.ts';
import type { RhythmDb } from '../../store/db.ts';
import { changeUnitPolicy } from '../../store/unit-setup.ts';
import { FormErrors } from '../components/FormErrors.tsx';
import { SeverityMark } from '../components/SeverityMark.tsx';
import { dayClockText } from '../time-text.ts';

const unitOf = (key: ThresholdKey) => (key.endsWith('Bpm') ? 'bpm' : 'ms');
type Editing = { key: ThresholdKey | 'defaultQtcFormula'; value: string; severity: Severity; reason: string };

/** The unit policy: each limit with its value, severity and source; changes need a reason and are kept as history. */
export function PolicyEditor({ db, unit, policy, changedBy, canEdit }: { db: RhythmDb; unit: Unit; policy: UnitPolicy; changedBy: string; canEdit: boolean }) {
  const [editing, setEditing] = useState<Editing | null>(null);
  const [errors, setErrors] = useState<string[]>([]);

  const save = async () => {
    if (!editing) return;
    const nowMs = Date.now();
    const value = editing.key === 'defaultQtcFormula' ? (editing.value as QtcFormula) : Number(editing.value);
    if (typeof value === 'number' && (!Number.isFinite(value) || editing.value.trim() === '')) {
      setErrors([`${thresholdLabels[editing.key as ThresholdKey]}: type a number.`]);
      return;
    }
    try {
      await changeUnitPolicy(
        db,
        unit.id,
        { key: editing.key, value, ...(editing.key === 'defaultQtcFormula' ? {} : { severity: editing.severity }), changedBy, changedAtMs: nowMs, reason: editing.reason.trim() },
        nowMs,
      );
      setEditing(null);
      setErrors([]);
    } catch (error) {
      setErrors(error instanceof ValidationError ? error.errors.map((e) => e.message) : ['Could not save the change; try again.']);
    }
  };

  const editor = (
    <form
      class="policy-edit"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      {editing?.key === 'defaultQtcFormula' ? (
        <label class="field">
          QTc formula
          <select value={editing.value} onChange={(e) => setEditing({ ...editing, value: e.currentTarget.value })}>
            {qtcFormulas.map((f) => (
              <option key={f} value={f}>
                {qtcFormulaNames[f]}
              </option>
            ))}
          </select>
        </label>
      ) : editing ? (
        <div class="inline-fields">
          <label class="field">
            New limit ({unitOf(editing.key as ThresholdKey)})
            <input inputMode="decimal" value={editing.value} onInput={(e) => setEditing({ ...editing, value: e.currentTarget.value })} />
          </label>
          <label class="field">
            Severity
            <select value={editing.severity} onChange={(e) => setEditing({ ...editing, severity: e.currentTarget.value as Severity })}>
              <option value="urgent">URGENT</option>
              <option value="caution">Caution</option>
              <option value="note">Note</option>
            </select>
          </label>
        </div>
      ) : null}
      <label class="field">
        Why (the unit protocol or decision behind it; required)
        <input value={editing?.reason ?? ''} onInput={(e) => editing && setEditing({ ...editing, reason: e.currentTarget.value })} />
      </label>
      <FormErrors messages={errors} />
      <div class="actions">
        <button type="submit" class="button button-primary">
          Save change
        </button>
        <button type="button" class="button" onClick={() => setEditing(null)}>
          Cancel
        </button>
      </div>
    </form>
  );

  return (
    <section aria-labelledby="policy-title">
      <h2 id="policy-title">Unit policy: limits that raise flags</h2>
      <p class="sub">Each default names its published source. Local policy governs: change a limit only as your unit's protocol says.</p>
      <table class="policy">
        <thead>
          <tr>
            <th scope="col">Limit</th>
            <th scope="col">Flags when</th>
            <th scope="col">Severity</th>
            <th scope="col">Source</th>
            {canEdit ? <th scope="col">Change</th> : null}
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">QTc formula</th>
            <td>{qtcFormulaNames[policy.defaultQtcFormula]}</td>
            <td>—</td>
            <td>Unit's choice; compute several, show one, never mix formulas in one trend.</td>
            {canEdit ? (
              <td>
                <button type="button" class="button" onClick={() => setEditing({ key: 'defaultQtcFormula', value: policy.defaultQtcFormula, severity: 'note', reason: '' })}>
                  Change
                </button>
              </td>
            ) : null}
          </tr>
          {thresholdKeys.map((key) => {
            const t = policy.thresholds[key];
            return (
              <tr key={key}>
                <th scope="row">{thresholdLabels[key]}</th>
                <td>
                  {thresholdComparators[key]} {t.value} {unitOf(key)}
                </td>
                <td>
                  <SeverityMark severity={t.severity} />
                </td>
                <td>{t.source}</td>
                {canEdit ? (
                  <td>
                    <button type="button" class="button" aria-label={`Change ${thresholdLabels[key]}`} onClick={() => setEditing({ key, value: String(t.value), severity: t.severity, reason: '' })}>
                      Change
                    </button>
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
      {editing ? editor : null}
      <h2>Who changed what</h2>
      {unit.policyOverrides.length === 0 ? (
        <p>No changes: every limit is the published default.</p>
      ) : (
        <ol class="history">
          {unit.policyOverrides.map((o, i) => (
            <li key={`${o.changedAtMs}-${i}`}>
              {dayClockText(o.changedAtMs, unit.timeZone)}: {o.changedBy} set {o.key === 'defaultQtcFormula' ? 'QTc formula' : thresholdLabels[o.key as ThresholdKey] ?? o.key} to{' '}
              {o.key === 'defaultQtcFormula' ? qtcFormulaNames[o.value as QtcFormula] : `${o.value}${o.severity ? ` (${o.severity})` : ''}`}. Why: {o.reason}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
