import { z } from 'zod';
import { msToSmallBoxes, smallBoxesToMs } from './boxes-to-ms.ts';
import type { FieldError } from './field-error.ts';
import { qtcFormulas } from './qtc.ts';
import { rhythmLabelIds } from './rhythm-labels.ts';
import { thresholdKeys } from './unit-policy.ts';

/**
 * Plausible ranges in ms for each count, whatever the paper speed. They refuse typing slips
 * (a QT of 80 boxes), not unusual patients: R-R 150-6000 ms is 400 down to 10 bpm (long pauses).
 * Engineering limits, common practice, no source.
 */
export const plausibleMs = {
  rr: { min: 150, max: 6000 },
  pp: { min: 150, max: 6000 },
  pr: { min: 40, max: 600 },
  qrs: { min: 20, max: 400 },
  qt: { min: 120, max: 1000 },
} as const;

/** At most this many R-R (or P-P) counts in one read. */
export const maxIntervalCounts = 100;
/** Six-second count limits: 1 to 40 complexes (10 to 400 bpm). */
export const sixSecondCountRange = { min: 1, max: 40 } as const;

const finite = (field: string) =>
  z.number({ error: `${field} must be a number` }).refine(Number.isFinite, { message: `${field} must be a finite number` });

const positiveCount = (field: string) => finite(field).refine((v) => v > 0, { message: `${field} must be more than 0 small boxes` });

const countList = (field: string) =>
  z
    .array(positiveCount(field), { error: `${field} must be a list of small-box counts` })
    .max(maxIntervalCounts, { message: `${field}: at most ${maxIntervalCounts} counts in one read` });

export const sexes = ['female', 'male', 'unknown'] as const;
export type Sex = (typeof sexes)[number];

/** The last read's derived figures, used for change-from-last-read flags. */
export const previousFiguresSchema = z.strictObject({
  rateBpm: finite('previous.rateBpm').refine((v) => v > 0 && v <= 400, { message: 'previous.rateBpm must be between 1 and 400 bpm' }).optional(),
  prMs: finite('previous.prMs').refine((v) => v > 0 && v <= 1000, { message: 'previous.prMs must be between 1 and 1000 ms' }).optional(),
  qrsMs: finite('previous.qrsMs').refine((v) => v > 0 && v <= 1000, { message: 'previous.qrsMs must be between 1 and 1000 ms' }).optional(),
  qtcMs: finite('previous.qtcMs').refine((v) => v >= 100 && v <= 1000, { message: 'previous.qtcMs must be between 100 and 1000 ms' }).optional(),
  qtcFormula: z.enum(qtcFormulas, { error: `previous.qtcFormula must be one of ${qtcFormulas.join(', ')}` }).optional(),
});
export type PreviousFigures = z.infer<typeof previousFiguresSchema>;

/** Simple per-read policy overrides (the validation kit and tests use them; units keep theirs with history). */
export const policyInputSchema = z.strictObject({
  defaultQtcFormula: z.enum(qtcFormulas, { error: `policy.defaultQtcFormula must be one of ${qtcFormulas.join(', ')}` }).optional(),
  thresholds: z.partialRecord(z.enum(thresholdKeys), finite('policy.thresholds value')).optional(),
  regularityMaxSpreadMs: finite('policy.regularityMaxSpreadMs').refine((v) => v >= 0 && v <= 1000, { message: 'policy.regularityMaxSpreadMs must be between 0 and 1000 ms' }).optional(),
  regularityMaxSpreadPercentOfMean: finite('policy.regularityMaxSpreadPercentOfMean').refine((v) => v >= 0 && v <= 100, { message: 'policy.regularityMaxSpreadPercentOfMean must be between 0 and 100' }).optional(),
});
export type PolicyInput = z.infer<typeof policyInputSchema>;

const baseReadInputSchema = z.strictObject(
  {
  paperSpeedMmPerS: z.union([z.literal(25), z.literal(50)], { error: 'paperSpeedMmPerS must be 25 or 50 (mm/s)' }),
  gainMmPerMv: z.union([z.literal(5), z.literal(10), z.literal(20)], { error: 'gainMmPerMv must be 5, 10 or 20 (mm/mV)' }).default(10),
  rrSmallBoxes: countList('rrSmallBoxes').default([]),
  ppSmallBoxes: countList('ppSmallBoxes').default([]),
  sixSecondQrsCount: finite('sixSecondQrsCount')
    .refine((v) => Number.isInteger(v) && v >= sixSecondCountRange.min && v <= sixSecondCountRange.max, {
      message: `sixSecondQrsCount must be a whole number from ${sixSecondCountRange.min} to ${sixSecondCountRange.max} complexes`,
    })
    .optional(),
  prSmallBoxes: positiveCount('prSmallBoxes').optional(),
  qrsSmallBoxes: positiveCount('qrsSmallBoxes').optional(),
  qtSmallBoxes: positiveCount('qtSmallBoxes').optional(),
  sex: z.enum(sexes, { error: 'sex must be female, male or unknown' }).default('unknown'),
  ageYears: finite('ageYears').refine((v) => Number.isInteger(v) && v >= 0 && v <= 120, { message: 'ageYears must be a whole number from 0 to 120' }).optional(),
  paced: z.boolean({ error: 'paced must be true or false' }).default(false),
  bundleBranchBlock: z.boolean({ error: 'bundleBranchBlock must be true or false' }).default(false),
  baselineQtcMs: finite('baselineQtcMs').refine((v) => v >= 200 && v <= 800, { message: 'baselineQtcMs must be between 200 and 800 ms' }).optional(),
  previous: previousFiguresSchema.optional(),
  rhythmLabel: z.enum(rhythmLabelIds, { error: 'rhythmLabel must be one of the listed rhythm labels' }).optional(),
  avBlockNoted: z.boolean({ error: 'avBlockNoted must be true or false' }).default(false),
  policy: policyInputSchema.optional(),
  },
  { error: (issue) => (issue.code === 'invalid_type' ? 'input must be an object holding the read\'s fields' : undefined) },
);

function rangeCheck(
  field: string,
  valuesSmallBoxes: readonly number[],
  limitsMs: { min: number; max: number },
  paperSpeedMmPerS: number,
  add: (e: FieldError) => void,
  indexed: boolean,
): void {
  const minBoxes = msToSmallBoxes(limitsMs.min, paperSpeedMmPerS);
  const maxBoxes = msToSmallBoxes(limitsMs.max, paperSpeedMmPerS);
  valuesSmallBoxes.forEach((boxes, i) => {
    const ms = smallBoxesToMs(boxes, paperSpeedMmPerS);
    if (ms < limitsMs.min || ms > limitsMs.max) {
      const name = indexed ? `${field}[${i}]` : field;
      add({
        field: name,
        min: minBoxes,
        max: maxBoxes,
        message: `${name} must be between ${minBoxes} and ${maxBoxes} small boxes at ${paperSpeedMmPerS} mm/s (${limitsMs.min}-${limitsMs.max} ms); got ${boxes}`,
      });
    }
  });
}

/** Cross-field checks: ranges that depend on paper speed, and intervals that cannot fit in the beat they belong to. */
function physiologyErrors(input: z.infer<typeof baseReadInputSchema>): FieldError[] {
  const errors: FieldError[] = [];
  const add = (e: FieldError) => errors.push(e);
  const speed = input.paperSpeedMmPerS;
  rangeCheck('rrSmallBoxes', input.rrSmallBoxes, plausibleMs.rr, speed, add, true);
  rangeCheck('ppSmallBoxes', input.ppSmallBoxes, plausibleMs.pp, speed, add, true);
  if (input.prSmallBoxes !== undefined) rangeCheck('prSmallBoxes', [input.prSmallBoxes], plausibleMs.pr, speed, add, false);
  if (input.qrsSmallBoxes !== undefined) rangeCheck('qrsSmallBoxes', [input.qrsSmallBoxes], plausibleMs.qrs, speed, add, false);
  if (input.qtSmallBoxes !== undefined) rangeCheck('qtSmallBoxes', [input.qtSmallBoxes], plausibleMs.qt, speed, add, false);

  if (input.rrSmallBoxes.length === 0 && input.sixSecondQrsCount === undefined) {
    add({ field: 'rrSmallBoxes', message: 'rrSmallBoxes: enter at least one R-R count in small boxes, or a sixSecondQrsCount' });
  }
  const longestRr = input.rrSmallBoxes.length > 0 ? Math.max(...input.rrSmallBoxes) : undefined;
  if (longestRr !== undefined && input.qtSmallBoxes !== undefined && input.qtSmallBoxes >= longestRr) {
    add({ field: 'qtSmallBoxes', max: longestRr, message: `qtSmallBoxes (${input.qtSmallBoxes}) must be shorter than the R-R it sits in (longest R-R entered: ${longestRr} small boxes)` });
  }
  if (longestRr !== undefined && input.prSmallBoxes !== undefined && input.prSmallBoxes >= longestRr) {
    add({ field: 'prSmallBoxes', max: longestRr, message: `prSmallBoxes (${input.prSmallBoxes}) must be shorter than the R-R (longest R-R entered: ${longestRr} small boxes)` });
  }
  if (input.qrsSmallBoxes !== undefined && input.qtSmallBoxes !== undefined && input.qrsSmallBoxes >= input.qtSmallBoxes) {
    add({ field: 'qrsSmallBoxes', max: input.qtSmallBoxes, message: `qrsSmallBoxes (${input.qrsSmallBoxes}) must be shorter than the QT (${input.qtSmallBoxes} small boxes), which contains it` });
  }
  return errors;
}

/** The input of one read, as the app, the server and the validation kit all take it. */
export const readInputSchema = baseReadInputSchema.superRefine((input, ctx) => {
  for (const e of physiologyErrors(input)) {
    ctx.addIssue({ code: 'custom', path: [e.field], message: e.message, params: { min: e.min, max: e.max } });
  }
});
export type ReadInput = z.infer<typeof readInputSchema>;
/** The same input before defaults are filled in (what a client sends). */
export type ReadInputDraft = z.input<typeof readInputSchema>;

/** Turns zod's issues into field-named errors; the message always starts with the field. */
export function fieldErrorsFromZod(error: z.ZodError): FieldError[] {
  const all = error.issues.map((issue) => {
    const path = issue.path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? String(p) : `.${String(p)}`)).join('');
    const field = path || 'input';
    const params = (issue as { params?: { min?: number; max?: number } }).params;
    const baseField = field.replace(/\[\d+\]$/, '');
    let message = issue.message;
    if (issue.code === 'unrecognized_keys') message = `${field === 'input' ? '' : `${field}: `}unknown field(s) ${issue.keys.join(', ')}; check the spelling`;
    else if (field !== baseField && message.startsWith(`${baseField} `)) message = `${field}${message.slice(baseField.length)}`;
    else if (!message.startsWith(field)) message = `${field}: ${message}`;
    const result: FieldError = { field, message };
    if (params?.min !== undefined) result.min = params.min;
    if (params?.max !== undefined) result.max = params.max;
    return result;
  });
  // One message per field: the one that states the allowed range wins over a bare "must be more than 0".
  const byField = new Map<string, FieldError>();
  for (const e of all) {
    const seen = byField.get(e.field);
    if (!seen || (seen.min === undefined && e.min !== undefined)) byField.set(e.field, e);
  }
  return [...byField.values()];
}

export type ParseResult<T> = { ok: true; value: T } | { ok: false; errors: FieldError[] };

/** Validates unknown input (JSON from a form, the network or stdin) into a ReadInput, never throwing. */
export function parseReadInput(raw: unknown): ParseResult<ReadInput> {
  const result = readInputSchema.safeParse(raw);
  if (result.success) return { ok: true, value: result.data };
  return { ok: false, errors: fieldErrorsFromZod(result.error) };
}
