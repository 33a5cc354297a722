import { ValidationError } from '../../../core/field-error.ts';
import { localDateTimeToEpochMs } from '../../../core/shifts.ts';
import { durationText } from '../../time-text.ts';

/** The audit event kinds the unit server writes, in plain words, in the order the filter lists them. */
export const auditKindWords: ReadonlyArray<readonly [kind: string, words: string]> = [
  ['read.signed', 'Read signed'],
  ['amendment.added', 'Read amended'],
  ['change.rejected', 'Change refused by the server'],
  ['stay.put', 'Patient admitted, details changed or monitoring ended'],
  ['handover.given', 'Handover given'],
  ['handover.received', 'Handover received'],
  ['export', 'Printed or exported'],
  ['sign-in.succeeded', 'Signed in'],
  ['sign-in.failed', 'Sign-in failed'],
  ['sign-in.refused', 'Sign-in refused after too many tries'],
  ['sign-out', 'Signed out'],
  ['session.revoked', 'Sessions ended by a unit admin'],
  ['user.created', 'Account created'],
  ['user.changed', 'Account changed'],
  ['device.enrolled', 'Tablet enrolled'],
  ['device.revoked', 'Tablet withdrawn'],
  ['bed.put', 'Bed added or changed'],
  ['unit.changed', 'Unit settings changed'],
  ['policy.changed', 'Unit policy changed'],
  ['unit.created', 'Unit created'],
];

const wordsByKind = new Map(auditKindWords);

/** An event kind in plain words; a kind this tablet does not know yet is shown as the server wrote it. */
export function auditKindText(kind: string): string {
  return wordsByKind.get(kind) ?? kind;
}

const dayMs = 86_400_000;

function nextLocalDate(localDate: string): string {
  const [y, m, d] = localDate.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d!) + dayMs).toISOString().slice(0, 10);
}

/**
 * The server-time range of two local dates on the unit's clock, both days included: from the
 * start of the first day to the last millisecond of the second (a day of 23 or 25 hours across a
 * clock change is taken as it is). Empty dates leave that end open.
 */
export function auditDateRange(fromDate: string, toDate: string, timeZone: string): { fromMs?: number; toMs?: number } {
  const range: { fromMs?: number; toMs?: number } = {};
  const errors = [];
  const at = (field: 'from' | 'to', localDate: string, words: string): number | null => {
    try {
      return localDateTimeToEpochMs(localDate, '00:00', timeZone);
    } catch {
      errors.push({ field, message: `${words}: "${localDate}" is not a date (yyyy-MM-dd).` });
      return null;
    }
  };
  if (fromDate.trim() !== '') {
    const ms = at('from', fromDate.trim(), 'From');
    if (ms !== null) range.fromMs = ms;
  }
  if (toDate.trim() !== '') {
    const valid = at('to', toDate.trim(), 'To');
    if (valid !== null) range.toMs = localDateTimeToEpochMs(nextLocalDate(toDate.trim()), '00:00', timeZone) - 1;
  }
  if (errors.length === 0 && range.fromMs !== undefined && range.toMs !== undefined && range.fromMs > range.toMs) {
    errors.push({ field: 'to', message: 'To: the last day must be on or after the first day.' });
  }
  if (errors.length > 0) throw new ValidationError(errors);
  return range;
}

/** Gaps between the tablet's time and the server's smaller than this are ordinary and not mentioned. */
export const timeGapWorthSayingMs = 2 * 60_000;

/**
 * "tablet time 3 h 00 min earlier" when the tablet's time of an event differs noticeably from the
 * server's, else null. Either cause is possible and the words do not guess: work done offline
 * reaches the server later, and a tablet clock can be wrong.
 */
export function tabletTimeGapText(clientTimeMs: number | null, serverTimeMs: number): string | null {
  if (clientTimeMs === null) return null;
  const gapMs = clientTimeMs - serverTimeMs;
  if (Math.abs(gapMs) < timeGapWorthSayingMs) return null;
  return `tablet time ${durationText(Math.abs(gapMs))} ${gapMs < 0 ? 'earlier' : 'later'}`;
}
