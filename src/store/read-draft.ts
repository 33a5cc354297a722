import type { ReadReason } from '../core/records.ts';
import type { RhythmLabelId } from '../core/rhythm-labels.ts';

/**
 * A read as the nurse is typing it: every field kept exactly as typed (text, not numbers), so a
 * half-typed "4." or a slip like "4o" survives a reload, a crash or a screen lock unchanged.
 */
export interface ReadDraftForm {
  /** Strip time as local 'yyyy-MM-dd' and 'HH:mm' in the unit's time zone. */
  stripLocalDate: string;
  stripLocalTime: string;
  paperSpeedMmPerS: 25 | 50;
  gainMmPerMv: 5 | 10 | 20;
  rrSmallBoxes: string[];
  ppSmallBoxes: string[];
  sixSecondQrsCount: string;
  prSmallBoxes: string;
  qrsSmallBoxes: string;
  qtSmallBoxes: string;
  rhythmLabel: RhythmLabelId | '';
  avBlockNoted: boolean;
  rhythmText: string;
  ectopy: string;
  reason: ReadReason;
  reasonText: string;
  notes: string;
}

/** One stored draft: whose it is, which stay, and the form as typed. */
export interface DraftRow {
  /** One draft per author and stay: `${authorId}:${stayId}`. */
  id: string;
  authorId: string;
  stayId: string;
  bedId: string;
  unitId: string;
  form: ReadDraftForm;
  /** When typing on this read began (becomes the read's entry time). */
  startedAtMs: number;
  updatedAtMs: number;
}

/** The draft id for an author's read on a stay. */
export function draftIdFor(authorId: string, stayId: string): string {
  return `${authorId}:${stayId}`;
}
