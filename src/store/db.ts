import Dexie from 'dexie';
import type { Table } from 'dexie';
import type { ReadAnalysis } from '../core/analyze-read.ts';
import type { Amendment, Bed, Change, ChangeKind, Handover, SignedRead, Stay, Unit } from '../core/records.ts';
import type { DraftRow } from './read-draft.ts';
import { schemaVersions } from './schema-versions.ts';

/** Where a record stands with the unit server. */
export type SyncStatus = 'pending' | 'accepted' | 'rejected';

/** A signed read as the tablet keeps it: the record, the figures this tablet derived, and its sync state. */
export interface StoredRead extends SignedRead {
  /** Figures of the read's current view (after amendments), derived by the core on this tablet. */
  analysis: ReadAnalysis | null;
  syncStatus: SyncStatus;
  rejectReason?: string;
}

/** An amendment as the tablet keeps it. */
export interface StoredAmendment extends Amendment {
  syncStatus: SyncStatus;
  rejectReason?: string;
}

/** A handover as the tablet keeps it. */
export interface StoredHandover extends Handover {
  syncStatus: SyncStatus;
  rejectReason?: string;
}

export type ClinicianRole = 'nurse' | 'charge-nurse' | 'unit-admin';

/** A clinician who may chart on this tablet; the PIN is kept only as a PBKDF2 hash. */
export interface ClinicianRow {
  id: string;
  name: string;
  role: ClinicianRole;
  pinHash: string;
  pinSalt: string;
  pinIterations: number;
  active: boolean;
  createdAtMs: number;
}

/** One key/value setting of this tablet (device id, current unit, storage status). */
export interface SettingRow {
  key: string;
  value: unknown;
}

export type OutboxStatus = 'pending' | 'sending' | 'accepted' | 'rejected';

/** One change waiting for (or answered by) the unit server, in the order it was made. */
export interface OutboxRow {
  seq?: number;
  changeId: string;
  kind: ChangeKind;
  change: Change;
  createdAtMs: number;
  status: OutboxStatus;
  rejectReason?: string;
  attempts: number;
}

/** Name of the tablet's database. */
export const databaseName = 'rhythm-ledger';

/** The tablet's local store: the primary copy of the nurse's work until the server acknowledges it. */
export class RhythmDb extends Dexie {
  units!: Table<Unit, string>;
  beds!: Table<Bed, string>;
  stays!: Table<Stay, string>;
  reads!: Table<StoredRead, string>;
  amendments!: Table<StoredAmendment, string>;
  drafts!: Table<DraftRow, string>;
  handovers!: Table<StoredHandover, string>;
  clinicians!: Table<ClinicianRow, string>;
  settings!: Table<SettingRow, string>;
  outbox!: Table<OutboxRow, number>;

  constructor(name: string = databaseName) {
    // Strict durability: a transaction completes only once the data is flushed to disk, so "saved"
    // on screen means a power cut or a crash cannot take the read back.
    super(name, { chromeTransactionDurability: 'strict' });
    for (const v of schemaVersions) {
      const version = this.version(v.version).stores(v.stores);
      if (v.upgrade) version.upgrade(v.upgrade);
    }
  }
}
