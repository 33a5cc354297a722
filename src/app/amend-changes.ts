import type { FieldError } from '../core/field-error.ts';
import type { AmendableFields, ReadCounts, SignedRead } from '../core/records.ts';
import type { ReadDraftForm } from '../store/read-draft.ts';
import { localDateAt } from '../core/shifts.ts';
import { clockText } from './time-text.ts';

const countKeys = ['paperSpeedMmPerS', 'gainMmPerMv', 'rrSmallBoxes', 'ppSmallBoxes', 'sixSecondQrsCount', 'prSmallBoxes', 'qrsSmallBoxes', 'qtSmallBoxes', 'rhythmLabel', 'avBlockNoted'] as const;
const textKeys = ['rhythmText', 'ectopy', 'notes'] as const;

/** A signed read's current view as an editable form (counts back to text). */
export function formFromRead(read: SignedRead, timeZone: string): ReadDraftForm {
  const text = (v: number | undefined) => (v === undefined ? '' : String(v));
  return {
    stripLocalDate: localDateAt(read.stripTimeMs, timeZone),
    stripLocalTime: clockText(read.stripTimeMs, timeZone),
    paperSpeedMmPerS: read.counts.paperSpeedMmPerS,
    gainMmPerMv: read.counts.gainMmPerMv,
    rrSmallBoxes: read.counts.rrSmallBoxes.length > 0 ? read.counts.rrSmallBoxes.map(String) : [''],
    ppSmallBoxes: read.counts.ppSmallBoxes.map(String),
    sixSecondQrsCount: text(read.counts.sixSecondQrsCount),
    prSmallBoxes: text(read.counts.prSmallBoxes),
    qrsSmallBoxes: text(read.counts.qrsSmallBoxes),
    qtSmallBoxes: text(read.counts.qtSmallBoxes),
    rhythmLabel: read.counts.rhythmLabel ?? '',
    avBlockNoted: read.counts.avBlockNoted,
    rhythmText: read.rhythmText ?? '',
    ectopy: read.ectopy ?? '',
    reason: read.reason,
    reasonText: read.reasonText ?? '',
    notes: read.notes ?? '',
  };
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/**
 * The fields an amendment changes: only what differs from the read's current view. A value cannot be
 * removed by an amendment (the history would not show what it was replaced with), so clearing one is refused.
 */
export function amendmentChanges(current: SignedRead, edited: { counts: ReadCounts; rhythmText: string; ectopy: string; notes: string; stripTimeMs: number }): { changes: AmendableFields; errors: FieldError[] } {
  const changes: AmendableFields = {};
  const errors: FieldError[] = [];
  for (const key of countKeys) {
    const before = current.counts[key];
    const after = edited.counts[key];
    if (same(before, after)) continue;
    if (after === undefined) {
      errors.push({ field: key, message: `${key}: a value cannot be removed by an amendment; correct it instead, or add a note.` });
      continue;
    }
    (changes as Record<string, unknown>)[key] = after;
  }
  for (const key of textKeys) {
    const before = current[key] ?? '';
    const after = edited[key].trim();
    if (before !== after) changes[key] = after;
  }
  if (edited.stripTimeMs !== current.stripTimeMs) changes.stripTimeMs = edited.stripTimeMs;
  return { changes, errors };
}
