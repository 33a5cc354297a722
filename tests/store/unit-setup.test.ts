import { describe, expect, it } from 'vitest';
import { ValidationError } from '../../src/core/field-error.ts';
import { admitStay, endStay } from '../../src/store/stays.ts';
import { changeUnitPolicy, saveBed, saveUnitSetup } from '../../src/store/unit-setup.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import { bed, newTestDb, stay, t0, unit } from './fixtures.ts';

describe('unit set-up', () => {
  it('writes the unit, its beds and one outbox change each, and makes it the current unit', async () => {
    const db = newTestDb();
    await saveUnitSetup(db, { unit, beds: [bed, { ...bed, id: 'bed-test-0002', label: 'Bed 2', sortOrder: 1 }] }, t0);
    expect(await db.beds.count()).toBe(2);
    expect((await db.outbox.orderBy('seq').toArray()).map((r) => r.kind)).toEqual(['unit.put', 'bed.put', 'bed.put']);
    expect((await db.settings.get('currentUnitId'))?.value).toBe(unit.id);
  });

  it('refuses two beds with one label and writes nothing', async () => {
    const db = newTestDb();
    await expect(saveUnitSetup(db, { unit, beds: [bed, { ...bed, id: 'bed-test-0002' }] }, t0)).rejects.toThrow(/beds: the label "Bed 1" is used twice/);
    expect(await db.units.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('refuses a shift pattern out of order and an unknown time zone, naming the field', async () => {
    const db = newTestDb();
    const badShifts = { ...unit, shiftPattern: { shifts: [{ name: 'Night', startLocalTime: '19:00' }, { name: 'Day', startLocalTime: '07:00' }] } };
    await expect(saveUnitSetup(db, { unit: badShifts, beds: [] }, t0)).rejects.toThrow(/shiftPattern: Shift "Day" starts at 07:00/);
    await expect(saveUnitSetup(db, { unit: { ...unit, timeZone: 'Mars/Olympus' }, beds: [] }, t0)).rejects.toThrow(/timeZone/);
  });

  it('refuses renaming a bed to a label another bed has', async () => {
    const db = newTestDb();
    await saveUnitSetup(db, { unit, beds: [bed, { ...bed, id: 'bed-test-0002', label: 'Bed 2', sortOrder: 1 }] }, t0);
    await expect(saveBed(db, { ...bed, label: 'bed 2' }, t0)).rejects.toThrow(/label: another bed is already called "bed 2"/);
  });

  it('records who changed a threshold, when and why, and the policy in force follows the change', async () => {
    const db = newTestDb();
    await saveUnitSetup(db, { unit, beds: [bed] }, t0);
    const next = await changeUnitPolicy(db, unit.id, { key: 'rateLowBpm', value: 50, changedBy: 'Ann Test', changedAtMs: t0 + 1, reason: 'Unit protocol uses 50 bpm' }, t0 + 1);
    expect(next.policyOverrides).toEqual([expect.objectContaining({ key: 'rateLowBpm', value: 50, changedBy: 'Ann Test' })]);
    expect(unitPolicyOf(next).thresholds.rateLowBpm.value).toBe(50);
    expect(unitPolicyOf(next).thresholds.rateLowBpm.source).toContain('Unit protocol uses 50 bpm');
    await expect(changeUnitPolicy(db, unit.id, { key: 'rateLowBpm', value: 45, changedBy: 'Ann Test', changedAtMs: t0, reason: '' }, t0)).rejects.toThrow(/say why the setting changed/);
  });
});

describe('stays', () => {
  it('admits a patient with an outbox change and refuses a second open stay on the same bed', async () => {
    const db = newTestDb();
    await admitStay(db, stay, t0);
    expect((await db.outbox.toArray()).map((r) => r.kind)).toEqual(['stay.put']);
    const second = admitStay(db, { ...stay, id: 'stay-test-0002', alias: 'X.Y.' }, t0);
    await expect(second).rejects.toBeInstanceOf(ValidationError);
    await expect(second).rejects.toThrow(/Q.Z. is still monitored on this bed/);
  });

  it('ends monitoring and then lets the bed take the next patient', async () => {
    const db = newTestDb();
    await admitStay(db, stay, t0);
    await endStay(db, stay.id, t0 + 1000, 'Ann Test', t0 + 1000);
    expect((await db.stays.get(stay.id))?.endMs).toBe(t0 + 1000);
    await admitStay(db, { ...stay, id: 'stay-test-0002', alias: 'X.Y.', startMs: t0 + 2000 }, t0 + 2000);
    expect(await db.stays.count()).toBe(2);
  });

  it('refuses an alias left empty, naming the field', async () => {
    await expect(admitStay(newTestDb(), { ...stay, alias: '' }, t0)).rejects.toThrow(/alias or initials are required/);
  });
});
