/** How a rhythm's ventricular R-R is expected to behave; used only to ask questions, never to diagnose. */
export type ExpectedRegularity = 'regular' | 'irregular' | 'either';

export interface RhythmLabel {
  id: string;
  name: string;
  expectedRegularity: ExpectedRegularity;
  /** Sinus-origin rhythm with 1:1 conduction, where a PR over the limit suggests an unnoted AV block. */
  sinusConducted: boolean;
}

/** Rhythm names of the trade a nurse picks from (free text goes in notes for anything else). */
export const rhythmLabels = [
  { id: 'sinus-rhythm', name: 'Sinus rhythm', expectedRegularity: 'regular', sinusConducted: true },
  { id: 'sinus-bradycardia', name: 'Sinus bradycardia', expectedRegularity: 'regular', sinusConducted: true },
  { id: 'sinus-tachycardia', name: 'Sinus tachycardia', expectedRegularity: 'regular', sinusConducted: true },
  { id: 'sinus-arrhythmia', name: 'Sinus arrhythmia', expectedRegularity: 'either', sinusConducted: true },
  { id: 'first-degree-av-block', name: 'Sinus rhythm with first-degree AV block', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'second-degree-av-block-type-1', name: 'Second-degree AV block, type I (Wenckebach)', expectedRegularity: 'irregular', sinusConducted: false },
  { id: 'second-degree-av-block-type-2', name: 'Second-degree AV block, type II', expectedRegularity: 'either', sinusConducted: false },
  { id: 'second-degree-av-block-2-to-1', name: 'Second-degree AV block, 2:1', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'third-degree-av-block', name: 'Third-degree (complete) AV block', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'atrial-fibrillation', name: 'Atrial fibrillation', expectedRegularity: 'irregular', sinusConducted: false },
  { id: 'atrial-flutter', name: 'Atrial flutter', expectedRegularity: 'either', sinusConducted: false },
  { id: 'supraventricular-tachycardia', name: 'Supraventricular tachycardia (SVT)', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'junctional-rhythm', name: 'Junctional rhythm', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'idioventricular-rhythm', name: 'Idioventricular rhythm', expectedRegularity: 'regular', sinusConducted: false },
  { id: 'ventricular-tachycardia', name: 'Ventricular tachycardia', expectedRegularity: 'either', sinusConducted: false },
  { id: 'paced-rhythm', name: 'Paced rhythm', expectedRegularity: 'either', sinusConducted: false },
  { id: 'other', name: 'Other (describe in notes)', expectedRegularity: 'either', sinusConducted: false },
] as const satisfies readonly RhythmLabel[];

export type RhythmLabelId = (typeof rhythmLabels)[number]['id'];
export const rhythmLabelIds = rhythmLabels.map((l) => l.id) as [RhythmLabelId, ...RhythmLabelId[]];

/** The label record for an id. */
export function rhythmLabel(id: RhythmLabelId): RhythmLabel {
  return rhythmLabels.find((l) => l.id === id)!;
}
