import type { Insertable, Kysely, Selectable, Transaction } from 'kysely';
import type { ReadAnalysis } from '../../core/analyze-read.ts';
import type { Amendment, Bed, Handover, SignedRead, Stay, Unit } from '../../core/records.ts';
import type { ChangeResult } from '../sync/change-result.ts';
import type { DatabaseSchema } from './database-schema.ts';
import type {
  AuditEvent,
  AuditFilter,
  DeviceRecord,
  LoggedChange,
  LoggedChangeText,
  NewAuditEvent,
  NewLoggedChange,
  Role,
  SessionRecord,
  StorageKind,
  Store,
  StoredAmendment,
  StoredRead,
  UnitTransaction,
  UserPatch,
  UserRecord,
} from './store.ts';
import { UnknownUnitError } from './store.ts';

type Db = Kysely<DatabaseSchema>;
type Tx = Transaction<DatabaseSchema>;

const parse = <T>(json: string): T => JSON.parse(json) as T;

function userFrom(row: Selectable<DatabaseSchema['users']>): UserRecord {
  return {
    id: row.id,
    unitId: row.unit_id,
    username: row.username,
    name: row.name,
    role: row.role as Role,
    passwordHash: row.password_hash,
    active: Number(row.active) === 1,
    createdAtMs: Number(row.created_at_ms),
  };
}

function deviceFrom(row: Selectable<DatabaseSchema['devices']>): DeviceRecord {
  return {
    id: row.id,
    unitId: row.unit_id,
    label: row.label,
    tokenHash: row.token_hash,
    enrolledBy: row.enrolled_by,
    enrolledAtMs: Number(row.enrolled_at_ms),
    revokedAtMs: row.revoked_at_ms === null ? null : Number(row.revoked_at_ms),
  };
}

function sessionFrom(row: Selectable<DatabaseSchema['sessions']>): SessionRecord {
  return {
    id: row.id,
    tokenHash: row.token_hash,
    userId: row.user_id,
    deviceId: row.device_id,
    createdAtMs: Number(row.created_at_ms),
    lastSeenAtMs: Number(row.last_seen_at_ms),
    expiresAtMs: Number(row.expires_at_ms),
    endedAtMs: row.ended_at_ms === null ? null : Number(row.ended_at_ms),
  };
}

function auditFrom(row: Selectable<DatabaseSchema['audit_events']>): AuditEvent {
  return {
    id: Number(row.id),
    unitId: row.unit_id,
    kind: row.kind,
    userId: row.user_id,
    username: row.username,
    recordId: row.record_id,
    deviceId: row.device_id,
    clientTimeMs: row.client_time_ms === null ? null : Number(row.client_time_ms),
    serverTimeMs: Number(row.server_time_ms),
    detail: row.detail,
  };
}

function changeFrom(row: Selectable<DatabaseSchema['change_log']>): LoggedChange {
  return {
    seq: Number(row.seq),
    changeId: row.change_id,
    kind: row.kind,
    recordId: row.record_id,
    record: parse<unknown>(row.record_json),
    derived: row.derived_json === null ? null : parse<ReadAnalysis>(row.derived_json),
    coreVersion: row.core_version,
    serverTimeMs: Number(row.server_time_ms),
    deviceTimeMs: Number(row.device_time_ms),
    userId: row.user_id,
    deviceId: row.device_id,
  };
}

function storedReadFrom(row: Selectable<DatabaseSchema['reads']>): StoredRead {
  return { read: parse<SignedRead>(row.record_json), analysis: parse<ReadAnalysis>(row.analysis_json), seq: Number(row.seq), serverTimeMs: Number(row.server_time_ms) };
}

function storedAmendmentFrom(row: Selectable<DatabaseSchema['amendments']>): StoredAmendment {
  return { amendment: parse<Amendment>(row.record_json), analysis: parse<ReadAnalysis>(row.analysis_json), seq: Number(row.seq), serverTimeMs: Number(row.server_time_ms) };
}

function auditRow(event: NewAuditEvent) {
  return {
    unit_id: event.unitId,
    kind: event.kind,
    user_id: event.userId,
    username: event.username,
    record_id: event.recordId,
    device_id: event.deviceId,
    client_time_ms: event.clientTimeMs,
    server_time_ms: event.serverTimeMs,
    detail: event.detail,
  };
}

/** Rows per multi-row insert when the buffered log rows are written (well under both engines' parameter limits). */
const flushChunkRows = 400;

/**
 * The unit-scoped queries of one push, inside the transaction that holds the unit's counter row.
 * Change-log, answer and audit rows are only written, never read back, within a push (answers are
 * also looked up here first), so they are buffered and written in a few multi-row inserts before the
 * commit: same transaction, same atomicity, far fewer round trips to PostgreSQL.
 */
class KyselyUnitTransaction implements UnitTransaction {
  private readonly pendingChanges: Array<Insertable<DatabaseSchema['change_log']>> = [];
  private readonly pendingAnswers = new Map<string, { row: Insertable<DatabaseSchema['change_answers']>; answer: ChangeResult }>();
  private readonly pendingAudit: Array<Insertable<DatabaseSchema['audit_events']>> = [];
  private unit: Unit | undefined;

  constructor(
    private readonly tx: Tx,
    readonly unitId: string,
    public lastSeq: number,
  ) {}

  /** Writes the buffered rows; called once the work is done, inside the same transaction. */
  async flush(): Promise<void> {
    const answers = [...this.pendingAnswers.values()].map((p) => p.row);
    for (let i = 0; i < this.pendingChanges.length; i += flushChunkRows) await this.tx.insertInto('change_log').values(this.pendingChanges.slice(i, i + flushChunkRows)).execute();
    for (let i = 0; i < answers.length; i += flushChunkRows) await this.tx.insertInto('change_answers').values(answers.slice(i, i + flushChunkRows)).execute();
    for (let i = 0; i < this.pendingAudit.length; i += flushChunkRows) await this.tx.insertInto('audit_events').values(this.pendingAudit.slice(i, i + flushChunkRows)).execute();
    this.pendingChanges.length = 0;
    this.pendingAnswers.clear();
    this.pendingAudit.length = 0;
  }

  async answerOf(changeId: string): Promise<ChangeResult | undefined> {
    const pending = this.pendingAnswers.get(changeId);
    if (pending) return pending.answer;
    const row = await this.tx.selectFrom('change_answers').select('answer_json').where('unit_id', '=', this.unitId).where('change_id', '=', changeId).executeTakeFirst();
    return row ? parse<ChangeResult>(row.answer_json) : undefined;
  }

  async rememberAnswer(changeId: string, answer: ChangeResult, atMs: number): Promise<void> {
    if (this.pendingAnswers.has(changeId)) throw new Error('a change is answered once');
    this.pendingAnswers.set(changeId, { row: { unit_id: this.unitId, change_id: changeId, answer_json: JSON.stringify(answer), server_time_ms: atMs }, answer: structuredClone(answer) });
  }

  async appendChange(change: NewLoggedChange): Promise<number> {
    const seq = this.lastSeq + 1;
    this.pendingChanges.push({
      unit_id: this.unitId,
      seq,
      change_id: change.changeId,
      kind: change.kind,
      record_id: change.recordId,
      record_json: JSON.stringify(change.record),
      derived_json: change.derived === null ? null : JSON.stringify(change.derived),
      core_version: change.coreVersion,
      server_time_ms: change.serverTimeMs,
      device_time_ms: change.deviceTimeMs,
      user_id: change.userId,
      device_id: change.deviceId,
    });
    this.lastSeq = seq;
    return seq;
  }

  async getUnit(): Promise<Unit> {
    if (!this.unit) {
      const row = await this.tx.selectFrom('units').select('record_json').where('id', '=', this.unitId).executeTakeFirstOrThrow();
      this.unit = parse<Unit>(row.record_json);
    }
    return structuredClone(this.unit);
  }

  async getUser(id: string): Promise<UserRecord | undefined> {
    const row = await this.tx.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
    return row ? userFrom(row) : undefined;
  }

  async isDeviceUser(deviceId: string, userId: string): Promise<boolean> {
    const row = await this.tx.selectFrom('device_users').select('user_id').where('device_id', '=', deviceId).where('user_id', '=', userId).executeTakeFirst();
    return row !== undefined;
  }

  async putUnit(unit: Unit): Promise<void> {
    this.unit = structuredClone(unit);
    await this.tx.updateTable('units').set({ name: unit.name, record_json: JSON.stringify(unit) }).where('id', '=', this.unitId).execute();
  }

  async getBed(id: string): Promise<Bed | undefined> {
    const row = await this.tx.selectFrom('beds').select('record_json').where('id', '=', id).where('unit_id', '=', this.unitId).executeTakeFirst();
    return row ? parse<Bed>(row.record_json) : undefined;
  }

  async putBed(bed: Bed, seq: number): Promise<void> {
    const values = { id: bed.id, unit_id: this.unitId, record_json: JSON.stringify(bed), updated_seq: seq };
    await this.tx.insertInto('beds').values(values).onConflict((oc) => oc.column('id').doUpdateSet({ record_json: values.record_json, updated_seq: seq })).execute();
  }

  async getStay(id: string): Promise<Stay | undefined> {
    const row = await this.tx.selectFrom('stays').select('record_json').where('id', '=', id).where('unit_id', '=', this.unitId).executeTakeFirst();
    return row ? parse<Stay>(row.record_json) : undefined;
  }

  async putStay(stay: Stay, seq: number): Promise<void> {
    const values = { id: stay.id, unit_id: this.unitId, bed_id: stay.bedId, record_json: JSON.stringify(stay), updated_seq: seq };
    await this.tx
      .insertInto('stays')
      .values(values)
      .onConflict((oc) => oc.column('id').doUpdateSet({ bed_id: values.bed_id, record_json: values.record_json, updated_seq: seq }))
      .execute();
  }

  async getRead(id: string): Promise<StoredRead | undefined> {
    const row = await this.tx.selectFrom('reads').selectAll().where('id', '=', id).where('unit_id', '=', this.unitId).executeTakeFirst();
    return row ? storedReadFrom(row) : undefined;
  }

  async previousRead(stayId: string, stripTimeMs: number, exceptReadId: string): Promise<StoredRead | undefined> {
    const row = await this.tx
      .selectFrom('reads')
      .selectAll()
      .where('unit_id', '=', this.unitId)
      .where('stay_id', '=', stayId)
      .where('id', '!=', exceptReadId)
      .where((eb) => eb.or([eb('strip_time_ms', '<', stripTimeMs), eb.and([eb('strip_time_ms', '=', stripTimeMs), eb('id', '<', exceptReadId)])]))
      .orderBy('strip_time_ms', 'desc')
      .orderBy('id', 'desc')
      .limit(1)
      .executeTakeFirst();
    return row ? storedReadFrom(row) : undefined;
  }

  async insertRead(read: SignedRead, analysis: ReadAnalysis, seq: number, atMs: number): Promise<void> {
    await this.tx
      .insertInto('reads')
      .values({
        id: read.id,
        unit_id: this.unitId,
        stay_id: read.stayId,
        author_id: read.authorId,
        strip_time_ms: read.stripTimeMs,
        record_json: JSON.stringify(read),
        analysis_json: JSON.stringify(analysis),
        core_version: analysis.coreVersion,
        seq,
        server_time_ms: atMs,
      })
      .execute();
  }

  async getAmendment(id: string): Promise<StoredAmendment | undefined> {
    const row = await this.tx.selectFrom('amendments').selectAll().where('id', '=', id).where('unit_id', '=', this.unitId).executeTakeFirst();
    return row ? storedAmendmentFrom(row) : undefined;
  }

  async amendmentsOf(readId: string): Promise<StoredAmendment[]> {
    const rows = await this.tx.selectFrom('amendments').selectAll().where('unit_id', '=', this.unitId).where('read_id', '=', readId).orderBy('seq').execute();
    return rows.map(storedAmendmentFrom);
  }

  async insertAmendment(amendment: Amendment, analysis: ReadAnalysis, seq: number, atMs: number): Promise<void> {
    await this.tx
      .insertInto('amendments')
      .values({
        id: amendment.id,
        unit_id: this.unitId,
        read_id: amendment.readId,
        author_id: amendment.authorId,
        record_json: JSON.stringify(amendment),
        analysis_json: JSON.stringify(analysis),
        core_version: analysis.coreVersion,
        seq,
        server_time_ms: atMs,
      })
      .execute();
  }

  async getHandover(id: string): Promise<Handover | undefined> {
    const row = await this.tx.selectFrom('handovers').select('record_json').where('id', '=', id).where('unit_id', '=', this.unitId).executeTakeFirst();
    return row ? parse<Handover>(row.record_json) : undefined;
  }

  async putHandover(handover: Handover, seq: number): Promise<void> {
    const values = { id: handover.id, unit_id: this.unitId, stay_id: handover.stayId, record_json: JSON.stringify(handover), updated_seq: seq };
    await this.tx.insertInto('handovers').values(values).onConflict((oc) => oc.column('id').doUpdateSet({ record_json: values.record_json, updated_seq: seq })).execute();
  }

  async appendAudit(event: NewAuditEvent): Promise<void> {
    this.pendingAudit.push(auditRow(event));
  }
}

/** The one storage implementation, over whichever Kysely dialect it is given. */
export class KyselyStore implements Store {
  constructor(
    private readonly db: Db,
    readonly kind: StorageKind,
  ) {}

  async createUnit(unit: Unit, atMs: number): Promise<boolean> {
    const result = await this.db
      .insertInto('units')
      .values({ id: unit.id, name: unit.name, record_json: JSON.stringify(unit), last_seq: 0, created_at_ms: atMs })
      .onConflict((oc) => oc.column('id').doNothing())
      .executeTakeFirst();
    return Number(result.numInsertedOrUpdatedRows ?? 0) === 1;
  }

  async getUnit(id: string): Promise<Unit | undefined> {
    const row = await this.db.selectFrom('units').select('record_json').where('id', '=', id).executeTakeFirst();
    return row ? parse<Unit>(row.record_json) : undefined;
  }

  async listUnits(): Promise<Unit[]> {
    const rows = await this.db.selectFrom('units').select('record_json').orderBy('created_at_ms').orderBy('id').execute();
    return rows.map((r) => parse<Unit>(r.record_json));
  }

  async countUsers(): Promise<number> {
    const row = await this.db.selectFrom('users').select((eb) => eb.fn.countAll().as('n')).executeTakeFirstOrThrow();
    return Number(row.n);
  }

  async createUser(user: UserRecord): Promise<boolean> {
    const result = await this.db
      .insertInto('users')
      .values({
        id: user.id,
        unit_id: user.unitId,
        username: user.username.toLowerCase(),
        name: user.name,
        role: user.role,
        password_hash: user.passwordHash,
        active: user.active ? 1 : 0,
        created_at_ms: user.createdAtMs,
      })
      .onConflict((oc) => oc.doNothing())
      .executeTakeFirst();
    return Number(result.numInsertedOrUpdatedRows ?? 0) === 1;
  }

  async getUser(id: string): Promise<UserRecord | undefined> {
    const row = await this.db.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
    return row ? userFrom(row) : undefined;
  }

  async findUserByUsername(username: string): Promise<UserRecord | undefined> {
    const row = await this.db.selectFrom('users').selectAll().where('username', '=', username.toLowerCase()).executeTakeFirst();
    return row ? userFrom(row) : undefined;
  }

  async listUsers(unitId: string): Promise<UserRecord[]> {
    const rows = await this.db.selectFrom('users').selectAll().where('unit_id', '=', unitId).orderBy('username').execute();
    return rows.map(userFrom);
  }

  async updateUser(id: string, patch: UserPatch): Promise<void> {
    const set: Partial<{ name: string; role: string; active: number; password_hash: string }> = {};
    if (patch.name !== undefined) set.name = patch.name;
    if (patch.role !== undefined) set.role = patch.role;
    if (patch.active !== undefined) set.active = patch.active ? 1 : 0;
    if (patch.passwordHash !== undefined) set.password_hash = patch.passwordHash;
    if (Object.keys(set).length === 0) return;
    await this.db.updateTable('users').set(set).where('id', '=', id).execute();
  }

  async createDevice(device: DeviceRecord): Promise<void> {
    await this.db
      .insertInto('devices')
      .values({
        id: device.id,
        unit_id: device.unitId,
        label: device.label,
        token_hash: device.tokenHash,
        enrolled_by: device.enrolledBy,
        enrolled_at_ms: device.enrolledAtMs,
        revoked_at_ms: device.revokedAtMs,
      })
      .execute();
  }

  async getDevice(id: string): Promise<DeviceRecord | undefined> {
    const row = await this.db.selectFrom('devices').selectAll().where('id', '=', id).executeTakeFirst();
    return row ? deviceFrom(row) : undefined;
  }

  async findDeviceByTokenHash(tokenHash: string): Promise<DeviceRecord | undefined> {
    const row = await this.db.selectFrom('devices').selectAll().where('token_hash', '=', tokenHash).executeTakeFirst();
    return row ? deviceFrom(row) : undefined;
  }

  async listDevices(unitId: string): Promise<DeviceRecord[]> {
    const rows = await this.db.selectFrom('devices').selectAll().where('unit_id', '=', unitId).orderBy('enrolled_at_ms').orderBy('id').execute();
    return rows.map(deviceFrom);
  }

  async revokeDevice(id: string, atMs: number): Promise<void> {
    await this.db.updateTable('devices').set({ revoked_at_ms: atMs }).where('id', '=', id).where('revoked_at_ms', 'is', null).execute();
  }

  async noteDeviceUser(deviceId: string, userId: string, atMs: number): Promise<void> {
    await this.db.insertInto('device_users').values({ device_id: deviceId, user_id: userId, first_at_ms: atMs }).onConflict((oc) => oc.doNothing()).execute();
  }

  async isDeviceUser(deviceId: string, userId: string): Promise<boolean> {
    const row = await this.db.selectFrom('device_users').select('user_id').where('device_id', '=', deviceId).where('user_id', '=', userId).executeTakeFirst();
    return row !== undefined;
  }

  async createSession(session: SessionRecord): Promise<void> {
    await this.db
      .insertInto('sessions')
      .values({
        id: session.id,
        token_hash: session.tokenHash,
        user_id: session.userId,
        device_id: session.deviceId,
        created_at_ms: session.createdAtMs,
        last_seen_at_ms: session.lastSeenAtMs,
        expires_at_ms: session.expiresAtMs,
        ended_at_ms: session.endedAtMs,
      })
      .execute();
  }

  async findSessionByTokenHash(tokenHash: string): Promise<SessionRecord | undefined> {
    const row = await this.db.selectFrom('sessions').selectAll().where('token_hash', '=', tokenHash).executeTakeFirst();
    return row ? sessionFrom(row) : undefined;
  }

  async touchSession(id: string, atMs: number): Promise<void> {
    await this.db.updateTable('sessions').set({ last_seen_at_ms: atMs }).where('id', '=', id).where('last_seen_at_ms', '<', atMs).execute();
  }

  async endSession(id: string, atMs: number): Promise<void> {
    await this.db.updateTable('sessions').set({ ended_at_ms: atMs }).where('id', '=', id).where('ended_at_ms', 'is', null).execute();
  }

  async endSessionsOfUser(userId: string, atMs: number): Promise<number> {
    const result = await this.db.updateTable('sessions').set({ ended_at_ms: atMs }).where('user_id', '=', userId).where('ended_at_ms', 'is', null).executeTakeFirst();
    return Number(result.numUpdatedRows);
  }

  async recordSignInFailure(attemptKey: string, atMs: number): Promise<void> {
    await this.db.insertInto('sign_in_failures').values({ attempt_key: attemptKey, at_ms: atMs }).execute();
  }

  async countSignInFailuresSince(attemptKey: string, sinceMs: number): Promise<number> {
    const row = await this.db
      .selectFrom('sign_in_failures')
      .select((eb) => eb.fn.countAll().as('n'))
      .where('attempt_key', '=', attemptKey)
      .where('at_ms', '>=', sinceMs)
      .executeTakeFirstOrThrow();
    return Number(row.n);
  }

  async oldestSignInFailureSince(attemptKey: string, sinceMs: number): Promise<number | undefined> {
    const row = await this.db
      .selectFrom('sign_in_failures')
      .select((eb) => eb.fn.min('at_ms').as('oldest'))
      .where('attempt_key', '=', attemptKey)
      .where('at_ms', '>=', sinceMs)
      .executeTakeFirst();
    return row?.oldest === null || row?.oldest === undefined ? undefined : Number(row.oldest);
  }

  async clearSignInFailures(attemptKey: string): Promise<void> {
    await this.db.deleteFrom('sign_in_failures').where('attempt_key', '=', attemptKey).execute();
  }

  async appendAudit(event: NewAuditEvent): Promise<void> {
    await this.db.insertInto('audit_events').values(auditRow(event)).execute();
  }

  async listAudit(filter: AuditFilter): Promise<AuditEvent[]> {
    let query = this.db
      .selectFrom('audit_events')
      .selectAll()
      .where((eb) => eb.or([eb('unit_id', '=', filter.unitId), eb('unit_id', 'is', null)]));
    if (filter.kind !== undefined) query = query.where('kind', '=', filter.kind);
    if (filter.userId !== undefined) query = query.where('user_id', '=', filter.userId);
    if (filter.fromMs !== undefined) query = query.where('server_time_ms', '>=', filter.fromMs);
    if (filter.toMs !== undefined) query = query.where('server_time_ms', '<=', filter.toMs);
    if (filter.beforeId !== undefined) query = query.where('id', '<', filter.beforeId);
    const rows = await query.orderBy('id', 'desc').limit(filter.limit).execute();
    return rows.map(auditFrom);
  }

  async inUnitTransaction<T>(unitId: string, work: (tx: UnitTransaction) => Promise<T>): Promise<T> {
    return this.db.transaction().execute(async (tx) => {
      // First statement: a no-op update that takes the unit's counter row lock (PostgreSQL) or the
      // write lock (SQLite) and reads the counter as committed by whoever held it before.
      const counter = await tx
        .updateTable('units')
        .set((eb) => ({ last_seq: eb.ref('last_seq') }))
        .where('id', '=', unitId)
        .returning('last_seq')
        .executeTakeFirst();
      if (!counter) throw new UnknownUnitError(unitId);
      const startSeq = Number(counter.last_seq);
      const unitTx = new KyselyUnitTransaction(tx, unitId, startSeq);
      const result = await work(unitTx);
      await unitTx.flush();
      if (unitTx.lastSeq !== startSeq) await tx.updateTable('units').set({ last_seq: unitTx.lastSeq }).where('id', '=', unitId).execute();
      return result;
    });
  }

  async pullChanges(unitId: string, afterSeq: number, limit: number): Promise<LoggedChange[]> {
    const rows = await this.db.selectFrom('change_log').selectAll().where('unit_id', '=', unitId).where('seq', '>', afterSeq).orderBy('seq').limit(limit).execute();
    return rows.map(changeFrom);
  }

  async pullChangesText(unitId: string, afterSeq: number, limit: number): Promise<LoggedChangeText[]> {
    const rows = await this.db
      .selectFrom('change_log')
      .select(['seq', 'change_id', 'kind', 'record_json', 'derived_json', 'core_version', 'server_time_ms', 'device_time_ms'])
      .where('unit_id', '=', unitId)
      .where('seq', '>', afterSeq)
      .orderBy('seq')
      .limit(limit)
      .execute();
    return rows.map((row) => ({
      seq: Number(row.seq),
      changeId: row.change_id,
      kind: row.kind,
      recordJson: row.record_json,
      derivedJson: row.derived_json,
      coreVersion: row.core_version,
      serverTimeMs: Number(row.server_time_ms),
      deviceTimeMs: Number(row.device_time_ms),
    }));
  }

  async lastSeq(unitId: string): Promise<number> {
    const row = await this.db.selectFrom('units').select('last_seq').where('id', '=', unitId).executeTakeFirst();
    if (!row) throw new UnknownUnitError(unitId);
    return Number(row.last_seq);
  }

  async close(): Promise<void> {
    await this.db.destroy();
  }
}
