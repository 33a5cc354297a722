import { roundForDisplay } from './display-rounding.ts';
import type { RhythmLabelId } from './rhythm-labels.ts';
import { rhythmLabel } from './rhythm-labels.ts';
import type { Regularity } from './rr-summary.ts';
import type { UnitPolicy } from './unit-policy.ts';

/** A mismatch between the figures and the chosen rhythm label, asked as a question; never a diagnosis. */
export interface RhythmQuestion {
  code: string;
  question: string;
}

export interface RhythmCheckInput {
  rhythmLabel: RhythmLabelId;
  rateBpm: number | null;
  regularity: Regularity;
  rrCount: number;
  rrSpreadMs: number | null;
  prMs: number | null;
  qrsMs: number | null;
  atrialRateBpm: number | null;
  paced: boolean;
  avBlockNoted: boolean;
}

/**
 * Questions where the figures and the label disagree. Criteria are textbook (sinus rate 60-100 with the
 * unit's limits; PR > 200 ms first-degree AV block, Kusumoto 2018; AF irregularly irregular, Hindricks 2020 ESC;
 * VT > 100 bpm, Al-Khatib 2017; complete block has atrial rate above ventricular rate) or common practice, no source.
 */
export function rhythmQuestions(input: RhythmCheckInput, policy: UnitPolicy): RhythmQuestion[] {
  const label = rhythmLabel(input.rhythmLabel);
  const name = `'${label.name}'`;
  const low = policy.thresholds.rateLowBpm.value;
  const high = policy.thresholds.rateHighBpm.value;
  const prLong = policy.thresholds.prLongMs.value;
  const qrsWide = policy.thresholds.qrsWideMs.value;
  const rate = input.rateBpm === null ? null : roundForDisplay(input.rateBpm);
  const questions: RhythmQuestion[] = [];
  const ask = (code: string, question: string) => questions.push({ code, question });

  if (rate !== null && input.rateBpm !== null) {
    if (input.rhythmLabel === 'sinus-rhythm' && input.rateBpm < low) ask('sinus-rate-low', `Rate ${rate} bpm with ${name}: is this sinus bradycardia?`);
    if (input.rhythmLabel === 'sinus-rhythm' && input.rateBpm > high) ask('sinus-rate-high', `Rate ${rate} bpm with ${name}: is this sinus tachycardia?`);
    if (input.rhythmLabel === 'sinus-bradycardia' && input.rateBpm >= low) ask('bradycardia-rate-not-low', `Rate ${rate} bpm with ${name}: the rate is not below ${low} bpm. Is the label right?`);
    if (input.rhythmLabel === 'sinus-tachycardia' && input.rateBpm <= high) ask('tachycardia-rate-not-high', `Rate ${rate} bpm with ${name}: the rate is not above ${high} bpm. Is the label right?`);
    if (input.rhythmLabel === 'ventricular-tachycardia' && input.rateBpm <= 100) ask('vt-rate-not-fast', `Rate ${rate} bpm with ${name}: VT is defined above 100 bpm. Is this an idioventricular or another rhythm?`);
    if (input.rhythmLabel === 'supraventricular-tachycardia' && input.rateBpm <= 100) ask('svt-rate-not-fast', `Rate ${rate} bpm with ${name}: SVT runs above 100 bpm. Is the label right?`);
    if (input.rhythmLabel === 'junctional-rhythm' && input.rateBpm > 60) ask('junctional-rate-fast', `Rate ${rate} bpm with ${name}: a junctional escape runs about 40-60 bpm. Is this accelerated junctional rhythm or junctional tachycardia?`);
  }

  if (input.regularity === 'irregular' && label.expectedRegularity === 'regular') {
    const spread = input.rrSpreadMs === null ? '' : ` by ${roundForDisplay(input.rrSpreadMs)} ms across ${input.rrCount} intervals`;
    ask('irregular-with-regular-label', `R-R varies${spread}, but ${name} is a regular rhythm. Is it irregular (ectopy, sinus arrhythmia, atrial fibrillation)?`);
  }
  if (input.regularity === 'regular' && input.rhythmLabel === 'atrial-fibrillation' && input.rrCount >= 3) {
    ask('regular-with-af', `R-R is regular across ${input.rrCount} intervals with ${name}, which is irregularly irregular. Could this be atrial flutter or another regular rhythm?`);
  }

  if (input.prMs !== null) {
    if (label.sinusConducted && input.prMs > prLong && !input.avBlockNoted) {
      ask('long-pr-no-av-block', `PR ${roundForDisplay(input.prMs)} ms with ${name} and no AV block noted: is there first-degree AV block?`);
    }
    if (input.rhythmLabel === 'first-degree-av-block' && input.prMs <= prLong) {
      ask('first-degree-pr-not-long', `PR ${roundForDisplay(input.prMs)} ms with ${name}: first-degree AV block needs PR above ${prLong} ms. Is the label right?`);
    }
    if (input.rhythmLabel === 'atrial-fibrillation') {
      ask('pr-with-af', `A PR interval was entered with ${name}, which has no consistent P waves. Check the label or the PR count.`);
    }
  }

  if (input.qrsMs !== null && input.qrsMs >= qrsWide && input.rhythmLabel === 'supraventricular-tachycardia') {
    ask('wide-qrs-svt', `QRS ${roundForDisplay(input.qrsMs)} ms with ${name}: a wide-complex tachycardia needs review. Is this ventricular tachycardia or SVT with aberrant conduction?`);
  }

  if (input.atrialRateBpm !== null && input.rateBpm !== null && input.rhythmLabel === 'third-degree-av-block' && input.atrialRateBpm <= input.rateBpm) {
    ask('complete-block-rates', `Atrial rate ${roundForDisplay(input.atrialRateBpm)} bpm is not above the ventricular rate ${rate} bpm with ${name}. Is the label right?`);
  }

  if (input.rhythmLabel === 'paced-rhythm' && !input.paced) ask('paced-label-not-paced', `${name} was chosen but the patient is not recorded as paced. Update the patient details or the label.`);
  if (input.paced && label.sinusConducted) ask('paced-patient-sinus-label', `The patient is recorded as paced and ${name} was chosen. Is the pacemaker capturing, or is this intrinsic rhythm?`);

  return questions;
}
