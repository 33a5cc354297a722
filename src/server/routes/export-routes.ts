import type { FastifyInstance, FastifyReply } from 'fastify';
import { z } from 'zod';
import { readsToCsv } from '../../core/csv-export.ts';
import { readsToFhirBundle } from '../../core/fhir-export.ts';
import type { Amendment, Bed, SignedRead, Stay, Unit } from '../../core/records.ts';
import { shiftFromKey } from '../../core/shift-key.ts';
import type { StayReads } from '../../core/stay-reads.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../core/unit-policy.ts';
import { auditEntry } from '../audit/audit-entry.ts';
import { authOf } from '../auth/access-guard.ts';
import { invalidInput, notFound } from '../http-error.ts';
import { parseInput } from '../parse-input.ts';
import type { Role, Store } from '../storage/store.ts';

// Exports made on the unit server from the unit's own record: every tablet's reads as the server
// holds them, figures derived afresh by the core (never a tablet's), amendments applied. The unit's
// records are read back from its change log, the one place that holds every version in server
// order (the latest stay, bed and unit version wins, as on the tablets). Every export is audited
// with ids and counts only.

/** Who may download patient exports from the server: the people who run handover and the unit. */
const exportRoles: readonly Role[] = ['charge-nurse', 'unit-admin'];

const pageSize = 500;

/** A unit's current records as its change log holds them. */
interface UnitRecords {
  unit: Unit;
  beds: Map<string, Bed>;
  stays: Map<string, Stay>;
  reads: SignedRead[];
  amendments: Amendment[];
}

async function unitRecords(store: Store, unitId: string): Promise<UnitRecords> {
  const unit = await store.getUnit(unitId);
  if (!unit) throw notFound('This unit is not on the server.');
  const records: UnitRecords = { unit, beds: new Map(), stays: new Map(), reads: [], amendments: [] };
  for (let after = 0; ; ) {
    const page = await store.pullChanges(unitId, after, pageSize);
    for (const change of page) {
      if (change.kind === 'unit.put') records.unit = change.record as Unit;
      else if (change.kind === 'bed.put') records.beds.set(change.recordId, change.record as Bed);
      else if (change.kind === 'stay.put') records.stays.set(change.recordId, change.record as Stay);
      else if (change.kind === 'read.sign') records.reads.push(change.record as SignedRead);
      else if (change.kind === 'amendment.add') records.amendments.push(change.record as Amendment);
    }
    if (page.length < pageSize) return records;
    after = page[page.length - 1]!.seq;
  }
}

function stayReadsOf(records: UnitRecords, stay: Stay): StayReads {
  return {
    stay,
    bedLabel: records.beds.get(stay.bedId)?.label ?? 'bed not known',
    reads: records.reads.filter((r) => r.stayId === stay.id),
    amendments: records.amendments.filter((a) => a.stayId === stay.id),
  };
}

type Format = 'fhir' | 'csv';

function send(reply: FastifyReply, format: Format, fileName: string, body: string): FastifyReply {
  return reply
    .type(format === 'csv' ? 'text/csv; charset=utf-8' : 'application/fhir+json; charset=utf-8')
    .header('content-disposition', `attachment; filename="${fileName}.${format === 'csv' ? 'csv' : 'fhir.json'}"`)
    .send(body);
}

function exportBody(format: Format, records: UnitRecords, stays: StayReads[], nowMs: number, range: { fromMs: number; toMs: number } | null): { body: string; readCount: number } {
  const policy = applyPolicyOverrides(defaultPolicy, records.unit.policyOverrides);
  if (format === 'csv') {
    const result = readsToCsv({ unit: records.unit, stays, ...(range ?? {}) }, policy);
    return { body: result.csv, readCount: result.rowCount };
  }
  const result = readsToFhirBundle({ unit: records.unit, stays, exportedAtMs: nowMs, ...(range ?? {}) }, policy);
  return { body: `${JSON.stringify(result.bundle, null, 2)}\n`, readCount: result.readCount };
}

const stayFile = /^([A-Za-z0-9_-]{8,64})\.(fhir\.json|csv)$/;
const shiftQuerySchema = z.strictObject({ shift: z.string({ error: 'shift is required: a shift key such as 2026-03-28/Night' }).min(1).max(60, 'shift must be at most 60 characters') });

/** Server-side exports of a stay or a shift (charge nurses and unit admins), each one audited. */
export function registerExportRoutes(app: FastifyInstance, { store, nowMs }: { store: Store; nowMs: () => number }): void {
  const audit = async (request: Parameters<typeof authOf>[0], format: Format, scope: 'stay' | 'shift', recordId: string, readCount: number) => {
    const { user, device } = authOf(request);
    await store.appendAudit(
      auditEntry({ kind: 'export', serverTimeMs: nowMs(), unitId: user.unitId, userId: user.id, username: user.username, deviceId: device?.id ?? null, recordId, detail: `${format} of ${scope} from the unit server: ${readCount} record(s)` }),
    );
  };

  app.get('/api/export/stays/:file', { config: { roles: exportRoles } }, async (request, reply) => {
    const { user } = authOf(request);
    const { file } = request.params as { file: string };
    const match = stayFile.exec(file);
    if (!match) throw invalidInput([{ field: 'file', message: 'file must be <stayId>.fhir.json or <stayId>.csv' }]);
    const [, stayId, suffix] = match as unknown as [string, string, string];
    const format: Format = suffix === 'csv' ? 'csv' : 'fhir';
    const records = await unitRecords(store, user.unitId);
    const stay = records.stays.get(stayId);
    if (!stay) throw notFound('No stay with this id on your unit.');
    const { body, readCount } = exportBody(format, records, [stayReadsOf(records, stay)], nowMs(), null);
    await audit(request, format, 'stay', stay.id, readCount);
    return send(reply, format, `stay-${stay.id}`, body);
  });

  for (const format of ['fhir', 'csv'] as const) {
    app.get(`/api/export/shift.${format === 'csv' ? 'csv' : 'fhir.json'}`, { config: { roles: exportRoles } }, async (request, reply) => {
      const { user } = authOf(request);
      const { shift: key } = parseInput(shiftQuerySchema, request.query);
      const records = await unitRecords(store, user.unitId);
      const shift = shiftFromKey(key, records.unit.shiftPattern, records.unit.timeZone);
      if (!shift) {
        const names = records.unit.shiftPattern.shifts.map((s) => s.name).join(', ');
        throw invalidInput([{ field: 'shift', message: `shift must name a shift of this unit as yyyy-MM-dd/Name (names: ${names})` }]);
      }
      const stays = [...records.stays.values()].filter((s) => s.startMs < shift.endMs && (s.endMs === null || s.endMs > shift.startMs)).map((s) => stayReadsOf(records, s));
      const { body, readCount } = exportBody(format, records, stays, nowMs(), { fromMs: shift.startMs, toMs: shift.endMs });
      await audit(request, format, 'shift', shift.key, readCount);
      return send(reply, format, `shift-${shift.startLocalDate}-${shift.name.replace(/[^A-Za-z0-9]+/g, '-')}`, body);
    });
  }
}
