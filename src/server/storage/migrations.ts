import type { Kysely, Migration, MigrationProvider } from 'kysely';
import { Migrator, sql } from 'kysely';
import type { StorageKind } from './store.ts';

/**
 * Schema migrations, in order, run at every start. Kysely's migrator takes a lock first
 * (an advisory lock on PostgreSQL), so several server processes starting together apply each once.
 */
function migrationsFor(kind: StorageKind): Record<string, Migration> {
  // The only dialect differences: how an auto-numbered key is declared and how a trigger is written.
  const autoId = (table: string) =>
    kind === 'postgres'
      ? sql`create table ${sql.id(table)} (id bigserial primary key)`
      : sql`create table ${sql.id(table)} (id integer primary key autoincrement)`;

  return {
    '0001-initial': {
      async up(db: Kysely<any>) {
        await db.schema
          .createTable('units')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('name', 'text', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('last_seq', 'integer', (c) => c.notNull().defaultTo(0))
          .addColumn('created_at_ms', 'bigint', (c) => c.notNull())
          .execute();

        await db.schema
          .createTable('beds')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('updated_seq', 'integer', (c) => c.notNull())
          .execute();

        await db.schema
          .createTable('stays')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('bed_id', 'text', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('updated_seq', 'integer', (c) => c.notNull())
          .execute();

        await db.schema
          .createTable('reads')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('stay_id', 'text', (c) => c.notNull())
          .addColumn('author_id', 'text', (c) => c.notNull())
          .addColumn('strip_time_ms', 'bigint', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('analysis_json', 'text', (c) => c.notNull())
          .addColumn('core_version', 'text', (c) => c.notNull())
          .addColumn('seq', 'integer', (c) => c.notNull())
          .addColumn('server_time_ms', 'bigint', (c) => c.notNull())
          .execute();
        await db.schema.createIndex('reads_by_stay_strip_time').on('reads').columns(['stay_id', 'strip_time_ms']).execute();

        await db.schema
          .createTable('amendments')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('read_id', 'text', (c) => c.notNull().references('reads.id'))
          .addColumn('author_id', 'text', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('analysis_json', 'text', (c) => c.notNull())
          .addColumn('core_version', 'text', (c) => c.notNull())
          .addColumn('seq', 'integer', (c) => c.notNull())
          .addColumn('server_time_ms', 'bigint', (c) => c.notNull())
          .execute();
        await db.schema.createIndex('amendments_by_read').on('amendments').columns(['read_id', 'seq']).execute();

        await db.schema
          .createTable('handovers')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('stay_id', 'text', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('updated_seq', 'integer', (c) => c.notNull())
          .execute();

        await db.schema
          .createTable('change_log')
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('seq', 'integer', (c) => c.notNull())
          .addColumn('change_id', 'text', (c) => c.notNull())
          .addColumn('kind', 'text', (c) => c.notNull())
          .addColumn('record_id', 'text', (c) => c.notNull())
          .addColumn('record_json', 'text', (c) => c.notNull())
          .addColumn('derived_json', 'text')
          .addColumn('core_version', 'text')
          .addColumn('server_time_ms', 'bigint', (c) => c.notNull())
          .addColumn('device_time_ms', 'bigint', (c) => c.notNull())
          .addColumn('user_id', 'text')
          .addColumn('device_id', 'text')
          .addPrimaryKeyConstraint('change_log_pk', ['unit_id', 'seq'])
          .addUniqueConstraint('change_log_change_once', ['unit_id', 'change_id'])
          .execute();

        await db.schema
          .createTable('change_answers')
          .addColumn('unit_id', 'text', (c) => c.notNull())
          .addColumn('change_id', 'text', (c) => c.notNull())
          .addColumn('answer_json', 'text', (c) => c.notNull())
          .addColumn('server_time_ms', 'bigint', (c) => c.notNull())
          .addPrimaryKeyConstraint('change_answers_pk', ['unit_id', 'change_id'])
          .execute();

        await db.schema
          .createTable('users')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('username', 'text', (c) => c.notNull().unique())
          .addColumn('name', 'text', (c) => c.notNull())
          .addColumn('role', 'text', (c) => c.notNull())
          .addColumn('password_hash', 'text', (c) => c.notNull())
          .addColumn('active', 'integer', (c) => c.notNull())
          .addColumn('created_at_ms', 'bigint', (c) => c.notNull())
          .execute();

        await db.schema
          .createTable('devices')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('unit_id', 'text', (c) => c.notNull().references('units.id'))
          .addColumn('label', 'text', (c) => c.notNull())
          .addColumn('token_hash', 'text', (c) => c.notNull().unique())
          .addColumn('enrolled_by', 'text', (c) => c.notNull())
          .addColumn('enrolled_at_ms', 'bigint', (c) => c.notNull())
          .addColumn('revoked_at_ms', 'bigint')
          .execute();

        await db.schema
          .createTable('device_users')
          .addColumn('device_id', 'text', (c) => c.notNull())
          .addColumn('user_id', 'text', (c) => c.notNull())
          .addColumn('first_at_ms', 'bigint', (c) => c.notNull())
          .addPrimaryKeyConstraint('device_users_pk', ['device_id', 'user_id'])
          .execute();

        await db.schema
          .createTable('sessions')
          .addColumn('id', 'text', (c) => c.primaryKey())
          .addColumn('token_hash', 'text', (c) => c.notNull().unique())
          .addColumn('user_id', 'text', (c) => c.notNull().references('users.id'))
          .addColumn('device_id', 'text')
          .addColumn('created_at_ms', 'bigint', (c) => c.notNull())
          .addColumn('last_seen_at_ms', 'bigint', (c) => c.notNull())
          .addColumn('expires_at_ms', 'bigint', (c) => c.notNull())
          .addColumn('ended_at_ms', 'bigint')
          .execute();
        await db.schema.createIndex('sessions_by_user').on('sessions').column('user_id').execute();

        await autoId('sign_in_failures').execute(db);
        await db.schema.alterTable('sign_in_failures').addColumn('attempt_key', 'text', (c) => c.notNull()).execute();
        await db.schema.alterTable('sign_in_failures').addColumn('at_ms', 'bigint', (c) => c.notNull()).execute();
        await db.schema.createIndex('sign_in_failures_by_key').on('sign_in_failures').columns(['attempt_key', 'at_ms']).execute();

        await autoId('audit_events').execute(db);
        for (const [name, type] of [
          ['unit_id', 'text'],
          ['kind', 'text'],
          ['user_id', 'text'],
          ['username', 'text'],
          ['record_id', 'text'],
          ['device_id', 'text'],
          ['client_time_ms', 'bigint'],
          ['server_time_ms', 'bigint'],
          ['detail', 'text'],
        ] as const) {
          await db.schema
            .alterTable('audit_events')
            .addColumn(name, type, (c) => (name === 'kind' || name === 'server_time_ms' ? c.notNull() : c))
            .execute();
        }
        await db.schema.createIndex('audit_events_by_unit').on('audit_events').columns(['unit_id', 'id']).execute();

        // The audit trail is append-only in the database itself, not only in the code that writes it.
        if (kind === 'postgres') {
          await sql`create function audit_events_refuse_change() returns trigger language plpgsql as $$
            begin raise exception 'audit events are append-only'; end; $$`.execute(db);
          await sql`create trigger audit_events_no_update before update or delete on audit_events
            for each row execute function audit_events_refuse_change()`.execute(db);
          await sql`create trigger audit_events_no_truncate before truncate on audit_events
            for each statement execute function audit_events_refuse_change()`.execute(db);
        } else {
          await sql`create trigger audit_events_no_update before update on audit_events
            begin select raise(abort, 'audit events are append-only'); end`.execute(db);
          await sql`create trigger audit_events_no_delete before delete on audit_events
            begin select raise(abort, 'audit events are append-only'); end`.execute(db);
        }
      },
    },
  };
}

/** Brings the database to the latest schema; throws with the failing migration's name. */
export async function migrateToLatest(db: Kysely<any>, kind: StorageKind): Promise<void> {
  const provider: MigrationProvider = { getMigrations: async () => migrationsFor(kind) };
  const migrator = new Migrator({ db, provider });
  const { error, results } = await migrator.migrateToLatest();
  if (error) {
    const failed = results?.find((r) => r.status === 'Error');
    throw new Error(`database migration ${failed?.migrationName ?? ''} failed: ${error instanceof Error ? error.message : String(error)}`);
  }
}
