import type { Transaction } from 'dexie';

/** One step of the tablet database's layout: the indexes of each table and how rows move up to it. */
export interface SchemaVersion {
  version: number;
  stores: Record<string, string | null>;
  upgrade?: (tx: Transaction) => Promise<void>;
}

/**
 * Every layout the tablet database has had, oldest first. A tablet may skip versions (left in a
 * drawer over an update), so each upgrade runs in order from the version it finds.
 * Never edit a shipped version: add a new one.
 */
export const schemaVersions: SchemaVersion[] = [
  {
    version: 1,
    stores: {
      units: 'id',
      beds: 'id, unitId',
      stays: 'id, unitId, bedId',
      reads: 'id, stayId, unitId, [stayId+stripTimeMs]',
      amendments: 'id, readId, stayId',
      drafts: 'id, stayId',
      handovers: 'id, stayId, unitId',
      clinicians: 'id',
      settings: 'key',
      outbox: '++seq, changeId, status',
    },
  },
  {
    // Version 2: reads, amendments and handovers carry their own sync state (until then only the
    // outbox row knew it), drafts are found by author, and outbox rows count send attempts.
    version: 2,
    stores: {
      reads: 'id, stayId, unitId, [stayId+stripTimeMs], syncStatus',
      amendments: 'id, readId, stayId, syncStatus',
      handovers: 'id, stayId, unitId, syncStatus',
      drafts: 'id, stayId, authorId',
    },
    upgrade: async (tx) => {
      // The outbox already knew each record's answer from the server; copy it onto the record.
      const answers = new Map<string, { status: string; rejectReason?: string }>();
      await tx.table('outbox').each((row: { change?: { record?: { id?: string } }; status?: string; rejectReason?: string }) => {
        const id = row.change?.record?.id;
        if (id && row.status) answers.set(id, { status: row.status, ...(row.rejectReason ? { rejectReason: row.rejectReason } : {}) });
      });
      const syncStateOf = (id: string) => {
        const answer = answers.get(id);
        if (answer?.status === 'accepted') return { syncStatus: 'accepted' };
        if (answer?.status === 'rejected') return { syncStatus: 'rejected', rejectReason: answer.rejectReason ?? 'rejected by the unit server' };
        return { syncStatus: 'pending' };
      };
      for (const table of ['reads', 'amendments', 'handovers']) {
        await tx.table(table).toCollection().modify((row: Record<string, unknown>) => {
          if (row.syncStatus === undefined) Object.assign(row, syncStateOf(String(row.id)));
        });
      }
      await tx.table('outbox').toCollection().modify((row: Record<string, unknown>) => {
        if (typeof row.attempts !== 'number') row.attempts = 0;
      });
    },
  },
];

/** The newest layout version. */
export const currentSchemaVersion = schemaVersions[schemaVersions.length - 1]!.version;
