import { describe, expect, it } from 'vitest';
import { readScheduleState } from '../../src/core/read-schedule.ts';
import { bedSchema, signedReadSchema, staySchema, unitSchema } from '../../src/core/records.ts';
import { buildDemoWard } from '../../src/store/demo-ward.ts';
import { deriveStayReads } from '../../src/core/stay-reads.ts';
import { loadDemoWard } from '../../src/store/load-demo-ward.ts';
import { signRead } from '../../src/store/sign-read.ts';
import { unitPolicyOf } from '../../src/store/unit-policy-of.ts';
import { newTestDb } from './fixtures.ts';

const nowMs = Date.UTC(2026, 4, 12, 3, 10);
const ward = buildDemoWard(nowMs);
const policy = unitPolicyOf(ward.unit);
const latestFlagsOf = (stayId: string) => {
  const stay = ward.stays.find((s) => s.id === stayId)!;
  return deriveStayReads(ward.reads, [], stay, policy).at(-1)?.analysis?.flags.map((f) => f.code) ?? [];
};

describe('the demo ward', () => {
  it('is the same ward every time for the same time (a pure builder)', () => {
    expect(buildDemoWard(nowMs)).toEqual(ward);
  });

  it('is an invented unit of 8 to 12 beds with patients by initials only', () => {
    expect(ward.unit.name).toContain('Harbourside General');
    expect(ward.beds.length).toBeGreaterThanOrEqual(8);
    expect(ward.beds.length).toBeLessThanOrEqual(12);
    for (const stay of ward.stays) expect(stay.alias).toMatch(/^([A-Z]\.){2}$/);
  });

  it('passes the shared record schemas', () => {
    expect(unitSchema.safeParse(ward.unit).success).toBe(true);
    for (const bed of ward.beds) expect(bedSchema.safeParse(bed).success).toBe(true);
    for (const stay of ward.stays) expect(staySchema.safeParse(stay).success).toBe(true);
    for (const read of ward.reads) expect(signedReadSchema.safeParse(read).success).toBe(true);
  });

  it('stores counts whose figures the core derives for every read', () => {
    for (const stay of ward.stays) {
      for (const derived of deriveStayReads(ward.reads, [], stay, policy)) expect(derived.errors).toEqual([]);
    }
  });

  it('holds a few days of reads with an AF patient, a paced patient and a prolonged QTc', () => {
    const days = (nowMs - Math.min(...ward.reads.map((r) => r.stripTimeMs))) / 86_400_000;
    expect(days).toBeGreaterThan(2);
    const labels = new Set(ward.reads.map((r) => r.counts.rhythmLabel));
    expect(labels).toContain('atrial-fibrillation');
    expect(labels).toContain('paced-rhythm');
    expect(ward.stays.some((s) => s.paced)).toBe(true);
    expect(latestFlagsOf('demo-stay-02')).toEqual(expect.arrayContaining(['qtc-high-risk', 'qtc-rise-from-baseline']));
    expect(latestFlagsOf('demo-stay-01')).toEqual([]);
  });

  it('has one bed overdue by its read schedule, an empty bed and a new admission awaiting a baseline read', () => {
    const statuses = ward.stays.map((stay) =>
      readScheduleState({ stayStartMs: stay.startMs, readTimesMs: ward.reads.filter((r) => r.stayId === stay.id).map((r) => r.stripTimeMs), intervalHours: 4, nowMs }).status,
    );
    expect(statuses.filter((s) => s === 'overdue')).toHaveLength(2);
    expect(ward.reads.some((r) => r.stayId === 'demo-stay-10')).toBe(false);
    expect(ward.stays.some((s) => s.bedId === 'demo-bed-09')).toBe(false);
  });

  it('loads into the tablet with derived figures and no outbox entries', async () => {
    const db = newTestDb();
    await loadDemoWard(db, nowMs, 1_000);
    expect(await db.beds.count()).toBe(ward.beds.length);
    expect(await db.reads.count()).toBe(ward.reads.length);
    expect(await db.outbox.count()).toBe(0);
    expect((await db.reads.toArray()).every((r) => r.analysis !== null)).toBe(true);
    expect((await db.settings.get('demoWard'))?.value).toBe(true);
    expect((await db.clinicians.count())).toBe(3);
  });

  it('keeps reads signed on the demo ward off the outbox, so invented patients never reach a unit server', async () => {
    const db = newTestDb();
    await loadDemoWard(db, nowMs, 1_000);
    const stay = ward.stays[0]!;
    const read = await signRead(db, {
      unit: ward.unit, stay, stripTimeMs: nowMs, counts: { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [20], ppSmallBoxes: [], avBlockNoted: false },
      reason: 'routine', author: { id: 'demo-clin-ash', name: 'Ash R. (demo nurse)' }, deviceId: 'demo-tablet', enteredAtMs: nowMs, nowMs,
    });
    expect(await db.reads.get(read.id)).toBeDefined();
    expect(await db.outbox.count()).toBe(0);
  });
});
