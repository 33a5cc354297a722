import type { ReadAnalysis } from '../core/analyze-read.ts';
import { analyzeUnknownRead } from '../core/analyze-read.ts';
import type { FieldError } from '../core/field-error.ts';
import { readInputFor } from '../core/read-derivation.ts';
import type { PreviousFigures } from '../core/read-input.ts';
import type { ReadCounts, Stay, Unit } from '../core/records.ts';
import { localDateAt, localDateTimeToEpochMs } from '../core/shifts.ts';
import type { UnitPolicy } from '../core/unit-policy.ts';
import type { ReadDraftForm } from '../store/read-draft.ts';
import { clockText } from './time-text.ts';

/** A blank read form with the unit's paper speed and gain, strip time now in the unit's time zone. */
export function newReadForm(unit: Pick<Unit, 'defaultPaperSpeedMmPerS' | 'defaultGainMmPerMv' | 'timeZone'>, nowMs: number): ReadDraftForm {
  return {
    stripLocalDate: localDateAt(nowMs, unit.timeZone),
    stripLocalTime: clockText(nowMs, unit.timeZone),
    paperSpeedMmPerS: unit.defaultPaperSpeedMmPerS,
    gainMmPerMv: unit.defaultGainMmPerMv,
    rrSmallBoxes: [''],
    ppSmallBoxes: [],
    sixSecondQrsCount: '',
    prSmallBoxes: '',
    qrsSmallBoxes: '',
    qtSmallBoxes: '',
    rhythmLabel: '',
    avBlockNoted: false,
    rhythmText: '',
    ectopy: '',
    reason: 'routine',
    reasonText: '',
    notes: '',
  };
}

/** Plain words for each form field, used in messages and labels. */
export function fieldLabel(field: string): string {
  const indexed = /^(rrSmallBoxes|ppSmallBoxes)\[(\d+)\]$/.exec(field);
  if (indexed) return `${indexed[1] === 'rrSmallBoxes' ? 'R-R' : 'P-P'} count ${Number(indexed[2]) + 1}`;
  const labels: Record<string, string> = {
    rrSmallBoxes: 'R-R count',
    ppSmallBoxes: 'P-P count',
    sixSecondQrsCount: 'Six-second QRS count',
    prSmallBoxes: 'PR count',
    qrsSmallBoxes: 'QRS count',
    qtSmallBoxes: 'QT count',
    paperSpeedMmPerS: 'Paper speed',
    gainMmPerMv: 'Gain',
    stripTime: 'Strip time',
    stripTimeMs: 'Strip time',
    reason: 'Reason',
    reasonText: 'Reason details',
    rhythmLabel: 'Rhythm',
    notes: 'Notes',
    rhythmText: 'Rhythm in words',
    ectopy: 'Ectopy',
    avBlockNoted: 'AV block noted',
  };
  return labels[field] ?? field;
}

/** A typed count as a number: '4', '4.5', '4,5' and '4½' are accepted; blank is "not entered". */
export function parseTypedCount(text: string): number | undefined {
  const trimmed = text.trim().replace(',', '.').replace(/\s*½$/, '.5').replace(/^\.5$/, '0.5');
  if (trimmed === '') return undefined;
  if (!/^\d*\.?\d*$/.test(trimmed) || trimmed === '.') return Number.NaN;
  return Number(trimmed.endsWith('.') ? trimmed.slice(0, -1) : trimmed);
}

/** The counts the form holds, and a message for each field whose text is not a number. */
export function countsFromForm(form: ReadDraftForm): { counts: ReadCounts; errors: FieldError[] } {
  const errors: FieldError[] = [];
  const one = (field: keyof ReadDraftForm & string, text: string, whole = false): number | undefined => {
    const value = parseTypedCount(text);
    if (value !== undefined && Number.isNaN(value)) {
      errors.push({ field, message: `${fieldLabel(field)}: "${text}" is not a number; type ${whole ? 'a whole number, e.g. 8' : 'small boxes, e.g. 4 or 4.5'}.` });
      return undefined;
    }
    return value;
  };
  const list = (field: 'rrSmallBoxes' | 'ppSmallBoxes', texts: string[]): number[] => {
    const values: number[] = [];
    texts.forEach((text, i) => {
      const value = parseTypedCount(text);
      if (value !== undefined && Number.isNaN(value)) {
        const name = `${field}[${i}]`;
        errors.push({ field: name, message: `${fieldLabel(name)}: "${text}" is not a number; type small boxes, e.g. 20 or 20.5.` });
      } else if (value !== undefined) values.push(value);
    });
    return values;
  };
  const counts: ReadCounts = {
    paperSpeedMmPerS: form.paperSpeedMmPerS,
    gainMmPerMv: form.gainMmPerMv,
    rrSmallBoxes: list('rrSmallBoxes', form.rrSmallBoxes),
    ppSmallBoxes: list('ppSmallBoxes', form.ppSmallBoxes),
    avBlockNoted: form.avBlockNoted,
  };
  const six = one('sixSecondQrsCount', form.sixSecondQrsCount, true);
  const pr = one('prSmallBoxes', form.prSmallBoxes);
  const qrs = one('qrsSmallBoxes', form.qrsSmallBoxes);
  const qt = one('qtSmallBoxes', form.qtSmallBoxes);
  if (six !== undefined) counts.sixSecondQrsCount = six;
  if (pr !== undefined) counts.prSmallBoxes = pr;
  if (qrs !== undefined) counts.qrsSmallBoxes = qrs;
  if (qt !== undefined) counts.qtSmallBoxes = qt;
  if (form.rhythmLabel !== '') counts.rhythmLabel = form.rhythmLabel;
  return { counts, errors };
}

/** What the form shows as the nurse types: the core's analysis, or the field-named reasons there is none yet. */
export interface LiveRead {
  counts: ReadCounts;
  analysis: ReadAnalysis | null;
  errors: FieldError[];
}

/** Derives the figures of the form as typed, with the same core call the store makes when signing. */
export function liveRead(form: ReadDraftForm, stay: Stay, previous: PreviousFigures | undefined, policy: UnitPolicy): LiveRead {
  const { counts, errors } = countsFromForm(form);
  const result = analyzeUnknownRead(readInputFor(counts, stay, previous), policy);
  if (result.ok && errors.length === 0) return { counts, analysis: result.value, errors: [] };
  const coreErrors = result.ok ? [] : result.errors.filter((e) => !errors.some((mine) => mine.field === e.field));
  return { counts, analysis: null, errors: [...errors, ...coreErrors] };
}

/** The strip time the form names, in epoch ms, or a message naming the field. */
export function stripTimeOf(form: ReadDraftForm, timeZone: string): { ok: true; ms: number } | { ok: false; error: FieldError } {
  try {
    return { ok: true, ms: localDateTimeToEpochMs(form.stripLocalDate, form.stripLocalTime, timeZone) };
  } catch {
    return { ok: false, error: { field: 'stripTime', message: 'Strip time: give the date and the time (HH:mm) printed on the strip.' } };
  }
}

const codeNames = /\b(rrSmallBoxes|ppSmallBoxes|sixSecondQrsCount|prSmallBoxes|qrsSmallBoxes|qtSmallBoxes|paperSpeedMmPerS|gainMmPerMv|stripTimeMs|reasonText|rhythmLabel)(\[\d+\])?/g;

/** A core message in the nurse's words: the field's code name becomes its label, and the message starts with it. */
export function messageInWords(error: FieldError): string {
  const label = fieldLabel(error.field);
  if (error.message.startsWith(`${label}:`)) return error.message;
  const stripped = error.message.startsWith(error.field) ? error.message.slice(error.field.length).replace(/^[:\s]+/, '') : error.message;
  return `${label}: ${stripped.replace(codeNames, (name) => fieldLabel(name))}`;
}
