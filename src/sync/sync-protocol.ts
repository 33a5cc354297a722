import { z } from 'zod';
import type { ReadAnalysis } from '../core/analyze-read.ts';
import type { FieldError } from '../core/field-error.ts';
import type { Change } from '../core/records.ts';
import { amendmentSchema, bedSchema, handoverSchema, signedReadSchema, staySchema, unitSchema } from '../core/records.ts';

/**
 * The tablet's side of the unit server's sync contract: what it sends, and schemas for every answer.
 * An answer that does not match is an error and nothing in it is applied, so a half-deployed or
 * misbehaving server can never write a malformed record into the nurse's tablet.
 */

/** Most changes the server takes in one push. */
export const maxChangesPerPush = 200;
/** Changes asked for in one pull page. */
export const pullPageLimit = 200;

/** Body of `POST /api/sync/push`. */
export interface PushRequest {
  changes: Change[];
}

const fieldErrorSchema = z.object({
  field: z.string(),
  message: z.string(),
  min: z.number().optional(),
  max: z.number().optional(),
});

const seqSchema = z.number().int().positive();

/** The server's answer to one pushed change. */
export const pushResultSchema = z.object({
  changeId: z.string().nullable(),
  status: z.enum(['accepted', 'rejected']),
  seq: seqSchema.optional(),
  reason: z.string().optional(),
  errors: z.array(fieldErrorSchema).optional(),
  /** On a refusal: the change may pass later (what it needs has not reached the server yet), so it is sent again. */
  retryable: z.boolean().optional(),
});
/** One validated push answer. */
export type PushResult = z.infer<typeof pushResultSchema> & { errors?: FieldError[] };

/** Answer of `POST /api/sync/push`: one result per change, in the order sent. */
export const pushResponseSchema = z.object({ results: z.array(pushResultSchema) });
/** A validated push answer as a whole. */
export type PushResponse = z.infer<typeof pushResponseSchema>;

/**
 * The parts of the server's derived figures the tablet shows. The server derives them with the
 * same core, so the shape is the core's ReadAnalysis; only its load-bearing fields are checked
 * here and the rest passes through unchanged.
 */
const derivedSchema = z.looseObject({
  coreVersion: z.string(),
  paperSpeedMmPerS: z.number(),
  rate: z.looseObject({ rateBpm: z.number(), method: z.string() }),
  intervals: z.looseObject({ prMs: z.number().nullable(), qrsMs: z.number().nullable(), qtMs: z.number().nullable() }),
  qtc: z.looseObject({ qtMs: z.number(), rrUsedMs: z.number() }).nullable(),
  flags: z.array(z.looseObject({ code: z.string(), severity: z.string(), sentence: z.string() })),
  questions: z.array(z.unknown()),
  defaultQtcFormula: z.string(),
});

// The change id lets the tablet check, on its next pull, that the change at its cursor is still the one it received.
const pulledBase = { seq: seqSchema, changeId: z.string().min(1).max(200).optional(), serverTimeMs: z.number().int().nonnegative() };
const optionalDerived = derivedSchema.nullable().optional();

/** One change of the unit as the server logged it, with the record validated by the shared schemas. */
export const pulledChangeSchema = z.discriminatedUnion('kind', [
  z.object({ ...pulledBase, kind: z.literal('unit.put'), record: unitSchema, derived: z.unknown().optional() }),
  z.object({ ...pulledBase, kind: z.literal('bed.put'), record: bedSchema, derived: z.unknown().optional() }),
  z.object({ ...pulledBase, kind: z.literal('stay.put'), record: staySchema, derived: z.unknown().optional() }),
  z.object({ ...pulledBase, kind: z.literal('read.sign'), record: signedReadSchema, derived: optionalDerived }),
  z.object({ ...pulledBase, kind: z.literal('amendment.add'), record: amendmentSchema, derived: optionalDerived }),
  z.object({ ...pulledBase, kind: z.literal('handover.put'), record: handoverSchema, derived: z.unknown().optional() }),
]);

type ParsedPulledChange = z.infer<typeof pulledChangeSchema>;

/** A pulled change after validation; for reads and amendments `derived` is the server's analysis by the same core. */
export type PulledChange = ParsedPulledChange extends infer C
  ? C extends { kind: 'read.sign' | 'amendment.add' }
    ? Omit<C, 'derived'> & { derived?: ReadAnalysis | null }
    : C
  : never;

/** Answer of `GET /api/sync/pull`. */
export const pullResponseSchema = z.object({
  changes: z.array(pulledChangeSchema),
  // A cursor of digits is a seq, whether the server writes it as a number or as text; keeping it a
  // number lets the tablet check it never moves past the changes it received.
  cursor: z.union([z.number().int().nonnegative(), z.string().max(200)]).transform((c) => (typeof c === 'string' && /^\d{1,15}$/.test(c) ? Number(c) : c)),
  hasMore: z.boolean(),
});
/** A validated pull page. */
export interface PullResponse {
  changes: PulledChange[];
  cursor: number | string;
  hasMore: boolean;
}

/** The signed-in user as the server describes them. */
export const serverUserSchema = z.object({
  id: z.string().min(1),
  name: z.string().min(1),
  username: z.string().min(1),
  role: z.enum(['nurse', 'charge-nurse', 'unit-admin']),
  unitId: z.string().min(1),
});
/** The signed-in user after validation. */
export type ServerUser = z.infer<typeof serverUserSchema>;

/** Answer of `POST /api/auth/sign-in`. */
export const signInResponseSchema = z.object({ token: z.string().min(1), expiresAtMs: z.number().int().positive(), user: serverUserSchema });
/** A validated sign-in answer. */
export type SignInResponse = z.infer<typeof signInResponseSchema>;

/** Answer of `POST /api/devices/enroll`. */
export const enrollResponseSchema = z.object({ deviceId: z.string().min(1), deviceToken: z.string().min(1) });
/** A validated enrolment answer. */
export type EnrollResponse = z.infer<typeof enrollResponseSchema>;

/** Answer of `GET /api/health`. */
export const healthResponseSchema = z.looseObject({ status: z.string(), coreVersion: z.string().optional(), serverVersion: z.string().optional() });
