import { useState } from 'preact/hooks';
import { ValidationError } from '../../core/field-error.ts';
import type { Unit } from '../../core/records.ts';
import type { RhythmDb } from '../../store/db.ts';
import { StorageFullError } from '../../store/storage-full.ts';
import { saveUnitSettings } from '../../store/unit-setup.ts';
import { shiftsAsText, shiftsFromText } from '../shift-presets.ts';

/** The ward's name, clock, shifts, read interval, screen lock and strip defaults. */
export function WardSettingsForm({ db, unit, canEdit }: { db: RhythmDb; unit: Unit; canEdit: boolean }) {
  const [name, setName] = useState(unit.name);
  const [timeZone, setTimeZone] = useState(unit.timeZone);
  const [shifts, setShifts] = useState(shiftsAsText(unit.shiftPattern.shifts));
  const [interval, setIntervalText] = useState(String(unit.readIntervalHours));
  const [idle, setIdle] = useState(String(unit.idleLockMinutes));
  const [speed, setSpeed] = useState(unit.defaultPaperSpeedMmPerS);
  const [gain, setGain] = useState(unit.defaultGainMmPerMv);
  const [message, setMessage] = useState<{ ok: boolean; lines: string[] } | null>(null);

  const save = async () => {
    try {
      await saveUnitSettings(
        db,
        { ...unit, name: name.trim(), timeZone: timeZone.trim(), shiftPattern: { shifts: shiftsFromText(shifts) }, readIntervalHours: Number(interval), idleLockMinutes: Number(idle), defaultPaperSpeedMmPerS: speed, defaultGainMmPerMv: gain },
        Date.now(),
      );
      setMessage({ ok: true, lines: ['Ward settings saved.'] });
    } catch (error) {
      if (error instanceof ValidationError) setMessage({ ok: false, lines: error.errors.map((e) => e.message) });
      else if (error instanceof StorageFullError) setMessage({ ok: false, lines: [error.message] });
      else setMessage({ ok: false, lines: ['Could not save; try again.'] });
    }
  };

  return (
    <form
      class="stay-form"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <fieldset disabled={!canEdit}>
        <legend>Ward</legend>
        <label class="field">
          Ward name
          <input value={name} onInput={(e) => setName(e.currentTarget.value)} />
        </label>
        <label class="field">
          Time zone (IANA name, e.g. Europe/London)
          <input value={timeZone} onInput={(e) => setTimeZone(e.currentTarget.value)} />
        </label>
        <label class="field">
          Shifts and start times, in order through the day (e.g. "Day 07:00, Night 19:00")
          <input value={shifts} onInput={(e) => setShifts(e.currentTarget.value)} />
        </label>
        <div class="inline-fields">
          <label class="field">
            Read interval (hours, 1 to 12)
            <input type="number" min={1} max={12} value={interval} onInput={(e) => setIntervalText(e.currentTarget.value)} />
          </label>
          <label class="field">
            Lock the screen after (minutes idle, 1 to 60)
            <input type="number" min={1} max={60} value={idle} onInput={(e) => setIdle(e.currentTarget.value)} />
          </label>
        </div>
        <div class="inline-fields">
          <label class="field">
            Default paper speed
            <select value={speed} onChange={(e) => setSpeed(Number(e.currentTarget.value) as 25 | 50)}>
              <option value={25}>25 mm/s</option>
              <option value={50}>50 mm/s</option>
            </select>
          </label>
          <label class="field">
            Default gain
            <select value={gain} onChange={(e) => setGain(Number(e.currentTarget.value) as 5 | 10 | 20)}>
              <option value={5}>5 mm/mV</option>
              <option value={10}>10 mm/mV</option>
              <option value={20}>20 mm/mV</option>
            </select>
          </label>
        </div>
        {message ? (
          <ul class={message.ok ? 'flash' : 'form-errors'} role={message.ok ? 'status' : 'alert'}>
            {message.lines.map((l) => (
              <li key={l}>{l}</li>
            ))}
          </ul>
        ) : null}
        {canEdit ? (
          <button type="submit" class="button button-primary">
            Save ward settings
          </button>
        ) : null}
      </fieldset>
    </form>
  );
}
