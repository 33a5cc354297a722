import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { csvColumns } from '../../src/core/csv-export.ts';
import type { FhirBundle } from '../../src/core/fhir-export.ts';
import type { SignedRead, Stay } from '../../src/core/records.ts';
import type { AuditEvent } from '../../src/server/storage/store.ts';
import { baseTimeMs, changeOf, demoAmendment, demoBed, demoRead, demoStay } from './fixtures.ts';
import { push, statusesOf } from './sync-helpers.ts';
import type { Clinician, TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

const hourMs = 3_600_000;

describe('exports made on the unit server', () => {
  let t: TestApp;
  let charge: Clinician;
  let nurseA: Clinician;
  let stayOne: Stay;
  let firstRead: SignedRead;

  beforeEach(async () => {
    t = await openTestApp();
    charge = await t.clinician('charge-nurse', { username: 'charge-c' });
    nurseA = await t.clinician('nurse', { username: 'nurse-a', deviceToken: await t.enrollDevice('Tablet one') });
    const nurseB = await t.clinician('nurse', { username: 'nurse-b', deviceToken: await t.enrollDevice('Tablet two') });
    const beds = [demoBed(t.unit.id, 'Bed 1'), demoBed(t.unit.id, 'Bed 2')];
    stayOne = demoStay(t.unit.id, beds[0]!.id, { alias: 'K.L.' });
    const stayTwo = demoStay(t.unit.id, beds[1]!.id, { alias: 'M.N.' });
    expect(statusesOf(await push(t.admin, [...beds.map((b) => changeOf('bed.put', b)), changeOf('stay.put', stayOne), changeOf('stay.put', stayTwo)]))).toEqual(['accepted', 'accepted', 'accepted', 'accepted']);
    // Day shift 2031-03-03 07:00-19:00 (Dublin, GMT in March): three reads in it from two tablets, one in the night after.
    firstRead = demoRead(stayOne, nurseA.user.id, { stripTimeMs: baseTimeMs + hourMs, authorName: 'A. Nurse' });
    const reads = [firstRead, demoRead(stayOne, nurseA.user.id, { stripTimeMs: baseTimeMs + 5 * hourMs, authorName: 'A. Nurse' })];
    expect(statusesOf(await push(nurseA, reads.map((r) => changeOf('read.sign', r))))).toEqual(['accepted', 'accepted']);
    expect(statusesOf(await push(nurseA, [changeOf('amendment.add', demoAmendment(firstRead, nurseA.user.id, { qtSmallBoxes: 10 }))]))).toEqual(['accepted']);
    const otherTablet = [demoRead(stayTwo, nurseB.user.id, { stripTimeMs: baseTimeMs + 2 * hourMs }), demoRead(stayTwo, nurseB.user.id, { stripTimeMs: baseTimeMs + 13 * hourMs })];
    expect(statusesOf(await push(nurseB, otherTablet.map((r) => changeOf('read.sign', r))))).toEqual(['accepted', 'accepted']);
  });
  afterEach(async () => {
    await t.close();
  });

  it('sends a stay\'s reads as CSV with the documented header, amendments applied, as a download', async () => {
    const answer = await charge.get(`/api/export/stays/${stayOne.id}.csv`);
    expect(answer.statusCode).toBe(200);
    expect(answer.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(answer.headers['content-disposition']).toBe(`attachment; filename="stay-${stayOne.id}.csv"`);
    const lines = answer.body.trimEnd().split('\r\n');
    expect(lines[0]).toBe(csvColumns.map((c) => c.name).join(','));
    expect(lines).toHaveLength(1 + 2);
    const column = (name: string) => csvColumns.findIndex((c) => c.name === name);
    const first = lines[1]!.split(',');
    // Amended QT 10 boxes x 40 ms = 400 ms at 25 mm/s (common practice, 1 small box = 40 ms).
    expect([first[column('qt_small_boxes')], first[column('qt_ms')], first[column('amended')], first[column('stay_alias')]]).toEqual(['10', '400', 'yes', 'K.L.']);
  });

  it('sends every bed\'s reads of one shift as a FHIR R4 Bundle, reads of other shifts left out', async () => {
    const answer = await charge.get(`/api/export/shift.fhir.json?shift=${encodeURIComponent('2031-03-03/Day')}`);
    expect(answer.statusCode).toBe(200);
    expect(answer.headers['content-type']).toBe('application/fhir+json; charset=utf-8');
    expect(answer.headers['content-disposition']).toBe('attachment; filename="shift-2031-03-03-Day.fhir.json"');
    const bundle = answer.json() as FhirBundle;
    const heartRates = bundle.entry.filter((e) => e.resource.code.coding?.some((c) => c.code === '8867-4'));
    expect(heartRates.map((e) => e.resource.subject.display).sort()).toEqual(['K.L.', 'K.L.', 'M.N.']);
  });

  it('audits each export with who, what and how many, never the patient', async () => {
    await charge.get(`/api/export/stays/${stayOne.id}.csv`);
    await charge.get('/api/export/shift.csv?shift=2031-03-03/Day');
    const events = ((await t.admin.get('/api/audit?kind=export')).json() as { events: AuditEvent[] }).events;
    expect(events.map((e) => [e.username, e.recordId, e.detail])).toEqual([
      ['charge-c', '2031-03-03/Day', 'csv of shift from the unit server: 3 record(s)'],
      ['charge-c', stayOne.id, 'csv of stay from the unit server: 2 record(s)'],
    ]);
    expect(JSON.stringify(events)).not.toContain('K.L.');
  });

  it('refuses a nurse account (exports are for charge nurses and unit admins)', async () => {
    const answer = await nurseA.get(`/api/export/stays/${stayOne.id}.csv`);
    expect([answer.statusCode, (answer.json() as { code: string }).code]).toEqual([403, 'role']);
  });

  it('names the field when the shift or the file is not understood, and says when the stay is unknown', async () => {
    const fieldsOf = async (url: string) => {
      const answer = await charge.get(url);
      return [answer.statusCode, ...((answer.json() as { errors?: Array<{ field: string }> }).errors ?? []).map((e) => e.field)];
    };
    expect(await fieldsOf('/api/export/shift.csv?shift=2031-03-03/Late')).toEqual([400, 'shift']);
    expect(await fieldsOf('/api/export/shift.csv')).toEqual([400, 'shift']);
    expect(await fieldsOf('/api/export/shift.csv?shift=2031-02-30/Day')).toEqual([400, 'shift']);
    expect(await fieldsOf(`/api/export/stays/${stayOne.id}.xlsx`)).toEqual([400, 'file']);
    expect((await charge.get('/api/export/stays/00000000-0000-7000-8000-000000000000.csv')).statusCode).toBe(404);
  });
});
