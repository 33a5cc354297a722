import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Unit } from '../../src/core/records.ts';
import type { AuditEvent } from '../../src/server/storage/store.ts';
import { baseTimeMs, changeOf, demoAmendment, demoBed, demoHandover, demoRead, demoStay } from './fixtures.ts';
import { pullAll, push } from './sync-helpers.ts';
import type { Clinician, TestApp } from './test-app.ts';
import { openTestApp, signIn } from './test-app.ts';

describe('audit trail', () => {
  let t: TestApp;
  let nurse: Clinician;
  const alias = 'Z.Q.';

  beforeEach(async () => {
    t = await openTestApp();
    nurse = await t.clinician('nurse', { username: 'nurse-a' });
    const bed = demoBed(t.unit.id);
    const stay = demoStay(t.unit.id, bed.id, { alias, notes: 'lives alone, daughter visits' });
    await push(t.admin, [changeOf('bed.put', bed), changeOf('stay.put', stay)]);
    t.clock.nowMs += 60_000;
    const read = demoRead(stay, nurse.user.id, { notes: 'patient anxious' });
    await push(nurse, [changeOf('read.sign', read, baseTimeMs + 55_000)]);
    await push(nurse, [changeOf('amendment.add', demoAmendment(read, nurse.user.id, { notes: 'patient calmer' }))]);
    await push(nurse, [changeOf('handover.put', demoHandover(stay, nurse.user.id))]);
    await nurse.post('/api/audit/exports', { format: 'csv', scope: 'stay', recordId: stay.id, recordCount: 1, clientTimeMs: baseTimeMs + 70_000 });
    await signIn(t.app, 'nurse-a', 'wrong password here');
    const unitRecord = (await pullAll(t.admin)).changes[0]?.record;
    await push(t.admin, [changeOf('unit.put', { ...(unitRecord as unknown as Unit), policyOverrides: [{ key: 'rateLowBpm', value: 50, changedBy: 'A. Admin', changedAtMs: baseTimeMs, reason: 'Unit protocol: 50 bpm' }] })]);
  });
  afterEach(async () => {
    await t.close();
  });

  const events = async (query = '') => ((await t.admin.get(`/api/audit${query}`)).json() as { events: AuditEvent[] }).events;

  it('records sign-ins, reads, amendments, handovers, exports and policy changes, newest first', async () => {
    const kinds = (await events()).map((e) => e.kind);
    expect(kinds.slice(0, 6)).toEqual(['policy.changed', 'sign-in.failed', 'export', 'handover.given', 'amendment.added', 'read.signed']);
    expect(kinds).toEqual(expect.arrayContaining(['sign-in.succeeded', 'device.enrolled', 'user.created', 'stay.put', 'bed.put', 'unit.created']));
  });

  it('says who, what, which record, from which tablet, with client and server time', async () => {
    const read = (await events('?kind=read.signed'))[0];
    expect(read).toMatchObject({ kind: 'read.signed', userId: nurse.user.id, username: 'nurse-a', clientTimeMs: baseTimeMs + 55_000, serverTimeMs: baseTimeMs + 60_000 });
    expect(read?.recordId).toMatch(/^[0-9a-f-]{36}$/);
    expect(read?.deviceId).toBe((await t.store.listDevices(t.unit.id))[0]?.id);
  });

  it('filters by kind, user and time, and pages backwards', async () => {
    expect((await events(`?userId=${nurse.user.id}`)).every((e) => e.userId === nurse.user.id)).toBe(true);
    expect((await events(`?from=${baseTimeMs + 60_000}&kind=read.signed`)).length).toBe(1);
    expect((await events(`?to=${baseTimeMs - 1}`)).length).toBe(0);
    const page = await events('?limit=2');
    const next = await events(`?limit=2&before=${page[1]?.id}`);
    expect(next[0]?.id).toBeLessThan(page[1]?.id ?? 0);
  });

  it('keeps patient data out of the trail: no alias, no notes', async () => {
    const all = JSON.stringify(await events('?limit=1000'));
    expect(all).not.toContain(alias);
    expect(all).not.toMatch(/anxious|calmer|daughter/);
  });

  it('shows the trail to unit admins only', async () => {
    expect((await nurse.get('/api/audit')).statusCode).toBe(403);
  });

  it('refuses an export report with an unknown format, naming the field', async () => {
    const answer = await nurse.post('/api/audit/exports', { format: 'fax', scope: 'unit', recordCount: 1, clientTimeMs: 1 });
    expect((answer.json() as { errors: Array<{ field: string }> }).errors.map((e) => e.field)).toEqual(['format']);
  });
});
