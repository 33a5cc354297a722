import { randomUUID } from 'node:crypto';
import { defaultReadIntervalHours } from '../../core/read-schedule.ts';
import type { Unit } from '../../core/records.ts';
import { unitSchema } from '../../core/records.ts';
import { fieldErrorsFromZod } from '../../core/read-input.ts';
import type { FieldError } from '../../core/field-error.ts';
import { ValidationError } from '../../core/field-error.ts';
import { auditEntry } from '../audit/audit-entry.ts';
import { hashPassword } from '../auth/password-hash.ts';
import type { Role, Store, UserRecord } from '../storage/store.ts';
import { passwordSchema, personNameSchema, roleSchema, usernameSchema } from './account-fields.ts';

export interface NewUnitInput {
  name: string;
  timeZone: string;
  idleLockMinutes: number;
}

export interface NewAccountInput {
  unitId: string;
  username: string;
  name: string;
  role: Role;
  password: string;
}

function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone });
    return true;
  } catch {
    return false;
  }
}

/** Creates a unit with the usual defaults (two 12 h shifts at 07:00 and 19:00, q4h reads, 25 mm/s, 10 mm/mV) and logs it as the unit's first change. */
export async function createUnit(store: Store, input: NewUnitInput, nowMs: number): Promise<Unit> {
  const errors: FieldError[] = [];
  if (!isTimeZone(input.timeZone)) errors.push({ field: 'timeZone', message: `timeZone must be an IANA time zone such as Europe/Dublin; got ${input.timeZone}` });
  const parsed = unitSchema.safeParse({
    id: randomUUID(),
    name: input.name,
    timeZone: input.timeZone,
    shiftPattern: { shifts: [{ name: 'Day', startLocalTime: '07:00' }, { name: 'Night', startLocalTime: '19:00' }] },
    readIntervalHours: defaultReadIntervalHours,
    defaultPaperSpeedMmPerS: 25,
    defaultGainMmPerMv: 10,
    idleLockMinutes: input.idleLockMinutes,
    policyOverrides: [],
    updatedAtMs: nowMs,
  });
  if (!parsed.success) errors.push(...fieldErrorsFromZod(parsed.error));
  if (errors.length > 0 || !parsed.success) throw new ValidationError(errors);
  const unit = parsed.data;
  await store.createUnit(unit, nowMs);
  // The unit is the first change every tablet pulls.
  await store.inUnitTransaction(unit.id, async (tx) => {
    await tx.appendChange({ changeId: `unit-created-${unit.id}`, kind: 'unit.put', recordId: unit.id, record: unit, derived: null, coreVersion: null, serverTimeMs: nowMs, deviceTimeMs: nowMs, userId: null, deviceId: null });
    await tx.appendAudit(auditEntry({ kind: 'unit.created', serverTimeMs: nowMs, unitId: unit.id, recordId: unit.id, detail: 'from the admin command' }));
  });
  return unit;
}

/** Creates an account after checking every field; throws ValidationError naming the field (a taken username included). */
export async function createAccount(store: Store, input: NewAccountInput, nowMs: number, passwordLogN?: number): Promise<UserRecord> {
  const errors: FieldError[] = [];
  const check = (field: string, result: { success: boolean; error?: unknown }) => {
    if (!result.success) {
      for (const e of fieldErrorsFromZod(result.error as never)) {
        const words = e.message.replace(/^input: /, '');
        errors.push({ ...e, field, message: words.startsWith(field) ? words : `${field}: ${words}` });
      }
    }
  };
  const username = usernameSchema.safeParse(input.username);
  const name = personNameSchema.safeParse(input.name);
  check('username', username);
  check('name', name);
  check('role', roleSchema.safeParse(input.role));
  check('password', passwordSchema.safeParse(input.password));
  if (errors.length > 0 || !username.success || !name.success) throw new ValidationError(errors);
  const user: UserRecord = {
    id: randomUUID(),
    unitId: input.unitId,
    username: username.data.toLowerCase(),
    name: name.data,
    role: input.role,
    passwordHash: await hashPassword(input.password, passwordLogN),
    active: true,
    createdAtMs: nowMs,
  };
  if (!(await store.createUser(user))) throw new ValidationError([{ field: 'username', message: `username ${user.username} is already taken; choose another` }]);
  await store.appendAudit(auditEntry({ kind: 'user.created', serverTimeMs: nowMs, unitId: input.unitId, recordId: user.id, detail: `role ${user.role}; from the admin command` }));
  return user;
}
