import type { ReadAnalysis } from '../../core/analyze-read.ts';
import type { Amendment, Bed, Handover, SignedRead, Stay, Unit } from '../../core/records.ts';
import type { ChangeResult } from '../sync/change-result.ts';

/**
 * The storage port: everything the server keeps, as plain request and response types.
 * One implementation (Kysely) runs over SQLite and PostgreSQL; `runStoreSuite` checks both.
 */

export type StorageKind = 'sqlite' | 'postgres';
export const roles = ['nurse', 'charge-nurse', 'unit-admin'] as const;
export type Role = (typeof roles)[number];

export interface UserRecord {
  id: string;
  unitId: string;
  /** Stored in lower case; sign-in matches without regard to case. */
  username: string;
  name: string;
  role: Role;
  passwordHash: string;
  active: boolean;
  createdAtMs: number;
}

export interface DeviceRecord {
  id: string;
  unitId: string;
  label: string;
  /** SHA-256 of the device token; the token itself is shown once at enrolment and never stored. */
  tokenHash: string;
  enrolledBy: string;
  enrolledAtMs: number;
  revokedAtMs: number | null;
}

export interface SessionRecord {
  id: string;
  /** SHA-256 of the bearer token; a copied database cannot be used to sign in. */
  tokenHash: string;
  userId: string;
  deviceId: string | null;
  createdAtMs: number;
  lastSeenAtMs: number;
  /** Absolute expiry; the idle limit is checked against lastSeenAtMs. */
  expiresAtMs: number;
  endedAtMs: number | null;
}

export interface AuditEvent {
  id: number;
  unitId: string | null;
  kind: string;
  userId: string | null;
  username: string | null;
  recordId: string | null;
  deviceId: string | null;
  clientTimeMs: number | null;
  serverTimeMs: number;
  /** Never patient data: kinds, field names, counts, reasons for refusals. */
  detail: string | null;
}
export type NewAuditEvent = Omit<AuditEvent, 'id'>;

export interface AuditFilter {
  unitId: string;
  kind?: string;
  userId?: string;
  fromMs?: number;
  toMs?: number;
  /** Only events with a smaller id (paging backwards from the newest). */
  beforeId?: number;
  limit: number;
}

/** One accepted change as the unit's log keeps it, in server order. */
export interface LoggedChange {
  seq: number;
  changeId: string;
  kind: string;
  recordId: string;
  record: unknown;
  derived: ReadAnalysis | null;
  coreVersion: string | null;
  serverTimeMs: number;
  deviceTimeMs: number;
  userId: string | null;
  deviceId: string | null;
}
export type NewLoggedChange = Omit<LoggedChange, 'seq'>;

/** A logged change with its record and analysis still as the stored JSON text, for pulls that pass them on unchanged. */
export interface LoggedChangeText {
  seq: number;
  changeId: string;
  kind: string;
  recordJson: string;
  derivedJson: string | null;
  coreVersion: string | null;
  serverTimeMs: number;
  deviceTimeMs: number;
}

export interface StoredRead {
  read: SignedRead;
  analysis: ReadAnalysis;
  seq: number;
  serverTimeMs: number;
}

export interface StoredAmendment {
  amendment: Amendment;
  analysis: ReadAnalysis;
  seq: number;
  serverTimeMs: number;
}

export type UserPatch = Partial<Pick<UserRecord, 'name' | 'role' | 'active' | 'passwordHash'>>;

/** Work done under the unit's change counter lock: every push of one unit runs one at a time. */
export interface UnitTransaction {
  readonly unitId: string;
  answerOf(changeId: string): Promise<ChangeResult | undefined>;
  rememberAnswer(changeId: string, answer: ChangeResult, atMs: number): Promise<void>;
  /** Appends to the unit's change log and returns the change's sequence number (dense: 1, 2, 3 ...). */
  appendChange(change: NewLoggedChange): Promise<number>;
  getUnit(): Promise<Unit>;
  /** A user of any unit (the caller checks the unit), read inside this transaction. */
  getUser(id: string): Promise<UserRecord | undefined>;
  isDeviceUser(deviceId: string, userId: string): Promise<boolean>;
  putUnit(unit: Unit): Promise<void>;
  getBed(id: string): Promise<Bed | undefined>;
  putBed(bed: Bed, seq: number): Promise<void>;
  getStay(id: string): Promise<Stay | undefined>;
  putStay(stay: Stay, seq: number): Promise<void>;
  getRead(id: string): Promise<StoredRead | undefined>;
  /** The stay's read with the latest strip time before the given one (ties broken by id), other than `exceptReadId`. */
  previousRead(stayId: string, stripTimeMs: number, exceptReadId: string): Promise<StoredRead | undefined>;
  insertRead(read: SignedRead, analysis: ReadAnalysis, seq: number, atMs: number): Promise<void>;
  getAmendment(id: string): Promise<StoredAmendment | undefined>;
  /** A read's amendments in server order. */
  amendmentsOf(readId: string): Promise<StoredAmendment[]>;
  insertAmendment(amendment: Amendment, analysis: ReadAnalysis, seq: number, atMs: number): Promise<void>;
  getHandover(id: string): Promise<Handover | undefined>;
  putHandover(handover: Handover, seq: number): Promise<void>;
  appendAudit(event: NewAuditEvent): Promise<void>;
}

export interface Store {
  readonly kind: StorageKind;
  /** Adds a unit with an empty change log; false when the id is already taken. */
  createUnit(unit: Unit, atMs: number): Promise<boolean>;
  getUnit(id: string): Promise<Unit | undefined>;
  listUnits(): Promise<Unit[]>;

  countUsers(): Promise<number>;
  /** False when the username is already taken (in any unit). */
  createUser(user: UserRecord): Promise<boolean>;
  getUser(id: string): Promise<UserRecord | undefined>;
  findUserByUsername(username: string): Promise<UserRecord | undefined>;
  listUsers(unitId: string): Promise<UserRecord[]>;
  updateUser(id: string, patch: UserPatch): Promise<void>;

  createDevice(device: DeviceRecord): Promise<void>;
  getDevice(id: string): Promise<DeviceRecord | undefined>;
  findDeviceByTokenHash(tokenHash: string): Promise<DeviceRecord | undefined>;
  listDevices(unitId: string): Promise<DeviceRecord[]>;
  revokeDevice(id: string, atMs: number): Promise<void>;
  /** Remembers that a clinician signed in online on this device (so its offline work can be pushed later). */
  noteDeviceUser(deviceId: string, userId: string, atMs: number): Promise<void>;
  isDeviceUser(deviceId: string, userId: string): Promise<boolean>;

  createSession(session: SessionRecord): Promise<void>;
  findSessionByTokenHash(tokenHash: string): Promise<SessionRecord | undefined>;
  touchSession(id: string, atMs: number): Promise<void>;
  endSession(id: string, atMs: number): Promise<void>;
  /** Ends every open session of a user; returns how many were open. */
  endSessionsOfUser(userId: string, atMs: number): Promise<number>;

  recordSignInFailure(attemptKey: string, atMs: number): Promise<void>;
  countSignInFailuresSince(attemptKey: string, sinceMs: number): Promise<number>;
  /** Oldest failure time at or after sinceMs, to say when the next attempt is allowed. */
  oldestSignInFailureSince(attemptKey: string, sinceMs: number): Promise<number | undefined>;
  clearSignInFailures(attemptKey: string): Promise<void>;

  /** The only way to write the audit trail: append. There is no update or delete. */
  appendAudit(event: NewAuditEvent): Promise<void>;
  /** Newest first; events not tied to any unit (sign-in failures for unknown names) are listed for every unit. */
  listAudit(filter: AuditFilter): Promise<AuditEvent[]>;

  /** Runs work holding the unit's change counter lock, in one database transaction. */
  inUnitTransaction<T>(unitId: string, work: (tx: UnitTransaction) => Promise<T>): Promise<T>;
  /** Committed changes of the unit with seq > afterSeq, in seq order. */
  pullChanges(unitId: string, afterSeq: number, limit: number): Promise<LoggedChange[]>;
  /** The same changes with records left as stored JSON text: a pull sends them on without parsing and re-serialising. */
  pullChangesText(unitId: string, afterSeq: number, limit: number): Promise<LoggedChangeText[]>;
  lastSeq(unitId: string): Promise<number>;
  close(): Promise<void>;
}

/** Thrown when work names a unit the store does not hold. */
export class UnknownUnitError extends Error {
  constructor(unitId: string) {
    super(`unknown unit ${unitId}`);
    this.name = 'UnknownUnitError';
  }
}
