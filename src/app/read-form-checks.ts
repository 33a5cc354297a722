import type { FieldError } from '../core/field-error.ts';
import type { ReadDraftForm } from '../store/read-draft.ts';
import type { LiveRead } from './read-form-values.ts';
import { stripTimeOf } from './read-form-values.ts';

/** A strip time this far ahead of the tablet clock is a typing slip (or a wrong clock), not a read. */
const futureToleranceMs = 5 * 60_000;

/** Everything that stops signing: bad counts (from the core), the strip time, and a missing reason. */
export function signingErrors(form: ReadDraftForm, live: LiveRead, timeZone: string, nowMs: number): FieldError[] {
  const errors = [...live.errors];
  const strip = stripTimeOf(form, timeZone);
  if (!strip.ok) errors.push(strip.error);
  else if (strip.ms > nowMs + futureToleranceMs) errors.push({ field: 'stripTime', message: 'Strip time: it is later than now on this tablet. Check the time on the strip (and the tablet clock).' });
  if (form.reason === 'other' && form.reasonText.trim() === '') errors.push({ field: 'reasonText', message: 'Reason details: say why this read was taken (reason "Other").' });
  return errors;
}

/** Whether the nurse has typed into a field yet (errors for untouched fields wait until signing is tried). */
export function fieldHasText(form: ReadDraftForm, field: string): boolean {
  const indexed = /^(rrSmallBoxes|ppSmallBoxes)\[(\d+)\]$/.exec(field);
  if (indexed) return (form[indexed[1] as 'rrSmallBoxes' | 'ppSmallBoxes'][Number(indexed[2])] ?? '').trim() !== '';
  const value = (form as unknown as Record<string, unknown>)[field];
  return typeof value === 'string' && value.trim() !== '';
}
