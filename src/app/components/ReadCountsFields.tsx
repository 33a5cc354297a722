import { roundForDisplay } from '../../core/display-rounding.ts';
import { smallBoxesToMs } from '../../core/boxes-to-ms.ts';
import { rateFromSixSecondCount } from '../../core/heart-rate.ts';
import { maxIntervalCounts } from '../../core/read-input.ts';
import type { ReadDraftForm } from '../../store/read-draft.ts';
import { fieldLabel, parseTypedCount } from '../read-form-values.ts';
import { BoxCountField } from './BoxCountField.tsx';
import { Segmented } from './Segmented.tsx';

interface Props {
  form: ReadDraftForm;
  setForm: (update: (f: ReadDraftForm) => ReadDraftForm) => void;
  errorOf: (field: string) => string | null;
}

/** The ms a typed count stands for at the chosen paper speed (the core's conversion), or nothing while it is not a number. */
function msOf(text: string, paperSpeedMmPerS: number): string | null {
  const boxes = parseTypedCount(text);
  if (boxes === undefined || Number.isNaN(boxes) || boxes <= 0) return null;
  return `${roundForDisplay(smallBoxesToMs(boxes, paperSpeedMmPerS))} ms`;
}

function sixSecondText(text: string): string | null {
  const count = parseTypedCount(text);
  return count !== undefined && Number.isInteger(count) && count > 0 ? `${rateFromSixSecondCount(count)} bpm` : null;
}

/** The strip's calibration and every count: R-R (several), six-second count, PR, QRS, QT and optional P-P. */
export function ReadCountsFields({ form, setForm, errorOf }: Props) {
  const set = <K extends keyof ReadDraftForm>(key: K, value: ReadDraftForm[K]) => setForm((f) => ({ ...f, [key]: value }));
  const setListItem = (key: 'rrSmallBoxes' | 'ppSmallBoxes', i: number, text: string) =>
    setForm((f) => ({ ...f, [key]: f[key].map((v, j) => (j === i ? text : v)) }));
  const removeListItem = (key: 'rrSmallBoxes' | 'ppSmallBoxes', i: number) => setForm((f) => ({ ...f, [key]: f[key].filter((_, j) => j !== i) }));
  const addListItem = (key: 'rrSmallBoxes' | 'ppSmallBoxes') => setForm((f) => ({ ...f, [key]: [...f[key], ''] }));
  const speed = form.paperSpeedMmPerS;

  return (
    <>
      <fieldset class="form-block">
        <legend>Strip calibration</legend>
        <Segmented label="Paper speed" options={[25, 50]} unit="mm/s" value={form.paperSpeedMmPerS} onChange={(v) => set('paperSpeedMmPerS', v)} />
        <Segmented label="Gain" options={[5, 10, 20]} unit="mm/mV" value={form.gainMmPerMv} onChange={(v) => set('gainMmPerMv', v)} />
        <p class="hint">One small box is {form.paperSpeedMmPerS === 25 ? '40' : '20'} ms at {form.paperSpeedMmPerS} mm/s. Half boxes are fine: type 4.5.</p>
      </fieldset>

      <fieldset class="form-block">
        <legend>Rate: R-R in small boxes</legend>
        {form.rrSmallBoxes.map((text, i) => (
          <BoxCountField
            key={`rr-${i}`}
            id={`rr-${i}`}
            label={fieldLabel(`rrSmallBoxes[${i}]`)}
            value={text}
            onInput={(t) => setListItem('rrSmallBoxes', i, t)}
            readout={msOf(text, speed)}
            error={errorOf(`rrSmallBoxes[${i}]`)}
            {...(form.rrSmallBoxes.length > 1 ? { onRemove: () => removeListItem('rrSmallBoxes', i) } : {})}
          />
        ))}
        {errorOf('rrSmallBoxes') ? (
          <p class="field-error" role="alert">
            {errorOf('rrSmallBoxes')}
          </p>
        ) : null}
        {form.rrSmallBoxes.length < maxIntervalCounts ? (
          <button type="button" class="button" onClick={() => addListItem('rrSmallBoxes')}>
            Add another R-R
          </button>
        ) : null}
        <BoxCountField
          id="six-second"
          label={fieldLabel('sixSecondQrsCount')}
          hint="(QRS complexes in 6 seconds, for irregular rhythms)"
          value={form.sixSecondQrsCount}
          step={1}
          onInput={(t) => set('sixSecondQrsCount', t)}
          readout={sixSecondText(form.sixSecondQrsCount)}
          error={errorOf('sixSecondQrsCount')}
        />
      </fieldset>

      <fieldset class="form-block">
        <legend>Intervals in small boxes</legend>
        <BoxCountField id="pr" label={fieldLabel('prSmallBoxes')} value={form.prSmallBoxes} onInput={(t) => set('prSmallBoxes', t)} readout={msOf(form.prSmallBoxes, speed)} error={errorOf('prSmallBoxes')} />
        <BoxCountField id="qrs" label={fieldLabel('qrsSmallBoxes')} value={form.qrsSmallBoxes} onInput={(t) => set('qrsSmallBoxes', t)} readout={msOf(form.qrsSmallBoxes, speed)} error={errorOf('qrsSmallBoxes')} />
        <BoxCountField id="qt" label={fieldLabel('qtSmallBoxes')} value={form.qtSmallBoxes} onInput={(t) => set('qtSmallBoxes', t)} readout={msOf(form.qtSmallBoxes, speed)} error={errorOf('qtSmallBoxes')} />
      </fieldset>

      <details class="form-block" open={form.ppSmallBoxes.length > 0}>
        <summary>Atrial rate: P-P counts (optional)</summary>
        {form.ppSmallBoxes.map((text, i) => (
          <BoxCountField
            key={`pp-${i}`}
            id={`pp-${i}`}
            label={fieldLabel(`ppSmallBoxes[${i}]`)}
            value={text}
            onInput={(t) => setListItem('ppSmallBoxes', i, t)}
            readout={msOf(text, speed)}
            error={errorOf(`ppSmallBoxes[${i}]`)}
            onRemove={() => removeListItem('ppSmallBoxes', i)}
          />
        ))}
        <button type="button" class="button" onClick={() => addListItem('ppSmallBoxes')}>
          Add a P-P count
        </button>
      </details>
    </>
  );
}
