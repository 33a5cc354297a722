import { z } from 'zod';
import { gainsMmPerMv } from './boxes-to-ms.ts';
import { qtcFormulas } from './qtc.ts';
import { readInputSchema, sexes } from './read-input.ts';
import { rhythmLabelIds } from './rhythm-labels.ts';
import { thresholdKeys } from './unit-policy.ts';

/**
 * Records shared by the tablet and the server, validated by the same schemas on both sides.
 * Times are epoch milliseconds; ids are client-made UUIDs (v7 for reads, so they sort by creation).
 */

const id = z.string().min(8, 'id must be at least 8 characters').max(64, 'id must be at most 64 characters');
const epochMs = z.number().int('time must be whole milliseconds').min(0).max(8.64e15);
const text = (field: string, max: number) => z.string().max(max, `${field} must be at most ${max} characters`);

export const shiftPatternSchema = z.object({
  shifts: z
    .array(z.object({ name: text('shift name', 40).min(1, 'shift name is required'), startLocalTime: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'startLocalTime must be HH:mm, 00:00 to 23:59') }))
    .min(1, 'a shift pattern needs at least one shift')
    .max(6, 'a shift pattern has at most 6 shifts'),
});

export const policyOverrideSchema = z.object({
  key: z.enum([...thresholdKeys, 'defaultQtcFormula', 'regularityMaxSpreadMs', 'regularityMaxSpreadPercentOfMean']),
  value: z.union([z.number().finite(), z.enum(qtcFormulas)]),
  severity: z.enum(['note', 'caution', 'urgent']).optional(),
  changedBy: text('changedBy', 120).min(1),
  changedAtMs: epochMs,
  reason: text('reason', 500).min(1, 'say why the setting changed'),
});

export const unitSchema = z.object({
  id,
  name: text('unit name', 80).min(1, 'unit name is required'),
  timeZone: z.string().min(1, 'time zone is required').max(64),
  shiftPattern: shiftPatternSchema,
  readIntervalHours: z.number().min(1, 'read interval must be 1 to 12 hours').max(12, 'read interval must be 1 to 12 hours'),
  defaultPaperSpeedMmPerS: z.union([z.literal(25), z.literal(50)]),
  defaultGainMmPerMv: z.union([z.literal(gainsMmPerMv[0]), z.literal(gainsMmPerMv[1]), z.literal(gainsMmPerMv[2])]),
  idleLockMinutes: z.number().int().min(1, 'idle lock must be 1 to 60 minutes').max(60, 'idle lock must be 1 to 60 minutes'),
  policyOverrides: z.array(policyOverrideSchema).max(500),
  updatedAtMs: epochMs,
});
export type Unit = z.infer<typeof unitSchema>;

export const bedSchema = z.object({
  id,
  unitId: id,
  label: text('bed label', 20).min(1, 'bed label is required'),
  sortOrder: z.number().int().min(0).max(10_000),
  active: z.boolean(),
});
export type Bed = z.infer<typeof bedSchema>;

export const ageBands = ['16-39', '40-69', '70+'] as const;

export const staySchema = z.object({
  id,
  unitId: id,
  bedId: id,
  /** Initials or an alias: the app never needs a full name. */
  alias: text('alias', 40).min(1, 'alias or initials are required'),
  recordNumber: text('record number', 40).optional(),
  sex: z.enum(sexes),
  ageBand: z.enum(ageBands).optional(),
  ageYears: z.number().int().min(16, 'ageYears must be 16 or more (adult ward)').max(120).optional(),
  paced: z.boolean(),
  bundleBranchBlock: z.boolean(),
  qtProlongingDrugs: text('QT-prolonging drugs', 300),
  baselineQtcMs: z.number().min(200, 'baselineQtcMs must be between 200 and 800 ms').max(800, 'baselineQtcMs must be between 200 and 800 ms').optional(),
  notes: text('notes', 2000),
  startMs: epochMs,
  endMs: epochMs.nullable(),
  updatedAtMs: epochMs,
  updatedBy: text('updatedBy', 120),
});
export type Stay = z.infer<typeof staySchema>;

export const readReasons = ['routine', 'alarm', 'rhythm-change', 'new-drug', 'post-procedure', 'other'] as const;
export type ReadReason = (typeof readReasons)[number];
export const readReasonNames: Record<ReadReason, string> = {
  routine: 'Routine (scheduled)',
  alarm: 'Alarm',
  'rhythm-change': 'Rhythm change',
  'new-drug': 'New QT-prolonging drug',
  'post-procedure': 'After a procedure',
  other: 'Other',
};

/** What the nurse counts on the strip for one read: the stored raw input, never the derived figures. */
export const readCountsSchema = z.strictObject({
  paperSpeedMmPerS: z.union([z.literal(25), z.literal(50)], { error: 'paperSpeedMmPerS must be 25 or 50 (mm/s)' }),
  gainMmPerMv: z.union([z.literal(5), z.literal(10), z.literal(20)], { error: 'gainMmPerMv must be 5, 10 or 20 (mm/mV)' }),
  rrSmallBoxes: z.array(z.number()).max(100),
  ppSmallBoxes: z.array(z.number()).max(100),
  sixSecondQrsCount: z.number().optional(),
  prSmallBoxes: z.number().optional(),
  qrsSmallBoxes: z.number().optional(),
  qtSmallBoxes: z.number().optional(),
  rhythmLabel: z.enum(rhythmLabelIds, { error: 'rhythmLabel must be one of the listed rhythm labels' }).optional(),
  avBlockNoted: z.boolean(),
});
export type ReadCounts = z.infer<typeof readCountsSchema>;

/** A signed read as the tablet sends it: counts and context, no derived figures (the receiver derives them). */
export const signedReadSchema = z.object({
  id,
  unitId: id,
  bedId: id,
  stayId: id,
  stripTimeMs: epochMs,
  enteredAtMs: epochMs,
  signedAtMs: epochMs,
  authorId: id,
  authorName: text('authorName', 120).min(1),
  deviceId: text('deviceId', 64),
  reason: z.enum(readReasons, { error: `reason must be one of ${readReasons.join(', ')}` }),
  reasonText: text('reasonText', 300).optional(),
  counts: readCountsSchema,
  rhythmText: text('rhythmText', 200).optional(),
  ectopy: text('ectopy', 200).optional(),
  notes: text('notes', 2000).optional(),
});
export type SignedRead = z.infer<typeof signedReadSchema>;

/** Fields an amendment may change; everything else about a signed read is fixed. */
export const amendableFieldsSchema = readCountsSchema
  .partial()
  .extend({ rhythmText: text('rhythmText', 200).optional(), ectopy: text('ectopy', 200).optional(), notes: text('notes', 2000).optional(), stripTimeMs: epochMs.optional() });
export type AmendableFields = z.infer<typeof amendableFieldsSchema>;

export const amendmentSchema = z.object({
  id,
  readId: id,
  unitId: id,
  stayId: id,
  changes: amendableFieldsSchema,
  reason: text('reason', 500).min(3, 'say why the read is amended (at least 3 characters)'),
  authorId: id,
  authorName: text('authorName', 120).min(1),
  deviceId: text('deviceId', 64),
  createdAtMs: epochMs,
});
export type Amendment = z.infer<typeof amendmentSchema>;

export const handoverSchema = z.object({
  id,
  unitId: id,
  stayId: id,
  shiftKey: text('shiftKey', 60),
  nurseText: text('nurseText', 4000),
  givenById: id,
  givenByName: text('givenByName', 120),
  givenAtMs: epochMs,
  receivedById: id.optional(),
  receivedByName: text('receivedByName', 120).optional(),
  receivedAtMs: epochMs.optional(),
  /** Read and amendment ids the written summary covered, so a later amendment shows as a change. */
  coveredRecordIds: z.array(id).max(1000),
});
export type Handover = z.infer<typeof handoverSchema>;

/** One change in a tablet's outbox; each has its own id and is applied at most once by the server. */
export const changeSchema = z.discriminatedUnion('kind', [
  z.object({ changeId: id, kind: z.literal('unit.put'), deviceTimeMs: epochMs, record: unitSchema }),
  z.object({ changeId: id, kind: z.literal('bed.put'), deviceTimeMs: epochMs, record: bedSchema }),
  z.object({ changeId: id, kind: z.literal('stay.put'), deviceTimeMs: epochMs, record: staySchema }),
  z.object({ changeId: id, kind: z.literal('read.sign'), deviceTimeMs: epochMs, record: signedReadSchema }),
  z.object({ changeId: id, kind: z.literal('amendment.add'), deviceTimeMs: epochMs, record: amendmentSchema }),
  z.object({ changeId: id, kind: z.literal('handover.put'), deviceTimeMs: epochMs, record: handoverSchema }),
]);
export type Change = z.infer<typeof changeSchema>;
export type ChangeKind = Change['kind'];

/** Validates the read input a stored read implies, so counts are checked with the same rules as live typing. */
export { readInputSchema };
