import { fireEvent, screen, waitFor } from '@testing-library/preact';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { localExportAuditsKey, queuedExportAuditsKey, recordExportAudit, sendQueuedExportAudits } from '../../src/app/handover-export-audit.ts';
import { shiftExportFile, stayExportFile } from '../../src/app/handover-export.ts';
import { shiftFromKey } from '../../src/app/handover-shift.ts';
import { HandoverDesk } from '../../src/app/screens/handover/HandoverDesk.tsx';
import { csvColumns } from '../../src/core/csv-export.ts';
import type { FhirBundle } from '../../src/core/fhir-export.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import type { ServerConnection } from '../../src/sync/server-call.ts';
import { deviceKey, sessionKey, writeSyncSetting } from '../../src/sync/sync-settings.ts';
import { dayShiftKey, deskDb, deskNowMs, deskUnit, fixClock, reads, renderDesk, stays } from './handover-fixture.tsx';

const policy = unitPolicyOf(deskUnit);
const dayShift = shiftFromKey(dayShiftKey, deskUnit)!;
const stayReadsOf = (i: number) => ({ stay: stays[i]!, bedLabel: `Bed ${i + 1}`, reads: reads.filter((r) => r.stayId === stays[i]!.id), amendments: [] });
const csvHeader = csvColumns.map((c) => c.name).join(',');

describe('export files made on the tablet', () => {
  it('writes a stay\'s reads as CSV with the documented header, named for the unit, bed and day but never the patient', () => {
    const file = stayExportFile('csv', { unit: deskUnit, policy, stayReads: stayReadsOf(0), nowMs: deskNowMs });
    const lines = file.text.trimEnd().split('\r\n');
    expect(lines[0]).toBe(csvHeader);
    expect(lines).toHaveLength(1 + 4);
    expect(file).toMatchObject({ fileName: '4-east-telemetry-test_bed-1_stay-from-2026-03-09.csv', mimeType: 'text/csv;charset=utf-8', readCount: 4, problems: [] });
    expect(file.fileName).not.toContain('K.L');
  });

  it('writes a shift\'s reads of every bed as one FHIR R4 Bundle, only reads inside the shift', () => {
    const file = shiftExportFile('fhir', { unit: deskUnit, policy, shift: dayShift, stays: [0, 1, 2].map(stayReadsOf), nowMs: deskNowMs });
    const bundle = JSON.parse(file.text) as FhirBundle;
    // Day shift 07:00-19:00: bed 1 has three reads in it, bed 2 three, bed 3 one.
    expect(file.readCount).toBe(7);
    expect(file.fileName).toBe('4-east-telemetry-test_shift-2026-03-10-day.fhir.json');
    expect(bundle).toMatchObject({ resourceType: 'Bundle', type: 'collection', timestamp: '2026-03-10T18:30:00+00:00' });
    const times = bundle.entry.map((e) => Date.parse(e.resource.effectiveDateTime));
    expect(Math.min(...times)).toBeGreaterThanOrEqual(dayShift.startMs);
    expect(Math.max(...times)).toBeLessThan(dayShift.endMs);
    expect(new Set(bundle.entry.map((e) => e.resource.subject.display))).toEqual(new Set(['K.L.', 'M.N.', 'O.P.']));
  });
});

describe('downloading from the handover desk', () => {
  let blobs: Blob[];
  let clicked: string[];
  beforeEach(() => {
    fixClock();
    blobs = [];
    clicked = [];
    vi.spyOn(URL, 'createObjectURL').mockImplementation((blob) => {
      blobs.push(blob as Blob);
      return `blob:test/${blobs.length}`;
    });
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => undefined);
    vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
      clicked.push(this.download);
    });
  });
  afterEach(() => {
    vi.restoreAllMocks();
    vi.useRealTimers();
  });

  it('downloads the shift as CSV and records the export on the tablet when there is no unit server', async () => {
    const db = await deskDb();
    renderDesk(<HandoverDesk shiftKey={null} />, { db });
    fireEvent.click(await screen.findByRole('button', { name: 'Download CSV' }));
    expect((await screen.findByText(/^Downloaded/)).textContent).toBe(
      'Downloaded 4-east-telemetry-test_shift-2026-03-10-day.csv (7 reads). Recorded on this tablet (no unit server to send the audit record to).',
    );
    expect(clicked).toEqual(['4-east-telemetry-test_shift-2026-03-10-day.csv']);
    const text = await blobs[0]!.text();
    expect(text.split('\r\n')[0]).toBe(csvHeader);
    expect(text.trimEnd().split('\r\n')).toHaveLength(8);
    const audits = (await db.settings.get(localExportAuditsKey))?.value;
    expect(audits).toEqual([{ format: 'csv', scope: 'shift', recordId: dayShiftKey, recordCount: 7, clientTimeMs: deskNowMs }]);
  });
});

describe('auditing exports with the unit server', () => {
  const posted: Array<{ path: string; body: unknown; auth: string | undefined }> = [];
  const connection = (answer: () => Promise<{ status: number; json(): Promise<unknown> }>): ServerConnection => ({
    baseUrl: 'https://unit.test',
    fetch: async (url, init) => {
      const response = await answer();
      posted.push({ path: url, body: init.body ? JSON.parse(init.body) : null, auth: init.headers.authorization });
      return response;
    },
    setTimeout: (run, ms) => setTimeout(run, ms),
    clearTimeout: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
    requestTimeoutMs: 5_000,
  });
  const ok = async () => ({ status: 204, json: async () => undefined });
  const offline = async (): Promise<never> => {
    throw new TypeError('Failed to fetch');
  };
  const entry = { format: 'fhir' as const, scope: 'stay' as const, recordId: 'stay-desk-0001', recordCount: 4, clientTimeMs: deskNowMs };

  async function signedInDb() {
    const db = await deskDb();
    await writeSyncSetting(db, sessionKey, { token: 'session-token-abcdefghijklmnop', expiresAtMs: deskNowMs + 3_600_000, user: { id: 'u', name: 'Cara Ward', username: 'cara', role: 'charge-nurse', unitId: deskUnit.id, active: true }, signedInAtMs: deskNowMs });
    await writeSyncSetting(db, deviceKey, { deviceId: 'device-1', deviceToken: 'device-token-abcdefghijklmnop' });
    return db;
  }

  beforeEach(() => {
    posted.length = 0;
  });

  it('posts the export to the audit trail with the session', async () => {
    const db = await signedInDb();
    expect(await recordExportAudit(db, connection(ok), entry)).toBe('sent');
    expect(posted).toEqual([{ path: 'https://unit.test/api/audit/exports', body: entry, auth: 'Bearer session-token-abcdefghijklmnop' }]);
  });

  it('queues the audit record offline and sends it, oldest first, once the server answers', async () => {
    const db = await signedInDb();
    expect(await recordExportAudit(db, connection(offline), entry)).toBe('queued');
    expect(await recordExportAudit(db, connection(offline), { ...entry, format: 'csv' })).toBe('queued');
    expect(((await db.settings.get(queuedExportAuditsKey))?.value as unknown[]).length).toBe(2);
    posted.length = 0;
    expect(await sendQueuedExportAudits(db, connection(ok))).toBe(2);
    expect(posted.map((p) => (p.body as { format: string }).format)).toEqual(['fhir', 'csv']);
    expect((await db.settings.get(queuedExportAuditsKey))?.value).toEqual([]);
  });

  it('keeps a refused audit record on the tablet with the reason instead of retrying it forever', async () => {
    const db = await signedInDb();
    const refused = async () => ({ status: 400, json: async () => ({ errors: [{ field: 'recordCount', message: 'recordCount must be a whole number' }] }) });
    expect(await recordExportAudit(db, connection(refused), entry)).toBe('kept-on-tablet');
    const kept = (await db.settings.get(localExportAuditsKey))?.value as Array<{ note: string }>;
    expect(kept[0]!.note).toMatch(/recordCount must be a whole number/);
    expect((await db.settings.get(queuedExportAuditsKey))?.value).toBeUndefined();
  });

  it('queues the record when nobody is signed in online yet', async () => {
    const db = await deskDb();
    expect(await recordExportAudit(db, connection(ok), entry)).toBe('queued');
    expect(posted).toEqual([]);
    await waitFor(async () => expect(((await db.settings.get(queuedExportAuditsKey))?.value as unknown[]).length).toBe(1));
  });
});
