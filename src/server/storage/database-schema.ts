import type { Generated } from 'kysely';

/**
 * Table shapes shared by SQLite and PostgreSQL. Records are stored as JSON text beside the few
 * columns queries need, so both engines hold exactly the same bytes the schemas validated.
 * Times are epoch milliseconds; flags are 0/1 integers (SQLite has no boolean).
 */
export interface DatabaseSchema {
  units: UnitsTable;
  beds: BedsTable;
  stays: StaysTable;
  reads: ReadsTable;
  amendments: AmendmentsTable;
  handovers: HandoversTable;
  change_log: ChangeLogTable;
  change_answers: ChangeAnswersTable;
  users: UsersTable;
  devices: DevicesTable;
  device_users: DeviceUsersTable;
  sessions: SessionsTable;
  sign_in_failures: SignInFailuresTable;
  audit_events: AuditEventsTable;
}

export interface UnitsTable {
  id: string;
  name: string;
  record_json: string;
  /** The unit's change counter: the last sequence number handed out; its row lock orders every push. */
  last_seq: number;
  created_at_ms: number;
}

export interface BedsTable {
  id: string;
  unit_id: string;
  record_json: string;
  updated_seq: number;
}

export interface StaysTable {
  id: string;
  unit_id: string;
  bed_id: string;
  record_json: string;
  updated_seq: number;
}

export interface ReadsTable {
  id: string;
  unit_id: string;
  stay_id: string;
  author_id: string;
  strip_time_ms: number;
  record_json: string;
  analysis_json: string;
  core_version: string;
  seq: number;
  server_time_ms: number;
}

export interface AmendmentsTable {
  id: string;
  unit_id: string;
  read_id: string;
  author_id: string;
  record_json: string;
  analysis_json: string;
  core_version: string;
  seq: number;
  server_time_ms: number;
}

export interface HandoversTable {
  id: string;
  unit_id: string;
  stay_id: string;
  record_json: string;
  updated_seq: number;
}

export interface ChangeLogTable {
  unit_id: string;
  seq: number;
  change_id: string;
  kind: string;
  record_id: string;
  record_json: string;
  derived_json: string | null;
  core_version: string | null;
  server_time_ms: number;
  device_time_ms: number;
  user_id: string | null;
  device_id: string | null;
}

export interface ChangeAnswersTable {
  unit_id: string;
  change_id: string;
  answer_json: string;
  server_time_ms: number;
}

export interface UsersTable {
  id: string;
  unit_id: string;
  username: string;
  name: string;
  role: string;
  password_hash: string;
  active: number;
  created_at_ms: number;
}

export interface DevicesTable {
  id: string;
  unit_id: string;
  label: string;
  token_hash: string;
  enrolled_by: string;
  enrolled_at_ms: number;
  revoked_at_ms: number | null;
}

export interface DeviceUsersTable {
  device_id: string;
  user_id: string;
  first_at_ms: number;
}

export interface SessionsTable {
  id: string;
  token_hash: string;
  user_id: string;
  device_id: string | null;
  created_at_ms: number;
  last_seen_at_ms: number;
  expires_at_ms: number;
  ended_at_ms: number | null;
}

export interface SignInFailuresTable {
  id: Generated<number>;
  attempt_key: string;
  at_ms: number;
}

export interface AuditEventsTable {
  id: Generated<number>;
  unit_id: string | null;
  kind: string;
  user_id: string | null;
  username: string | null;
  record_id: string | null;
  device_id: string | null;
  client_time_ms: number | null;
  server_time_ms: number;
  detail: string | null;
}
