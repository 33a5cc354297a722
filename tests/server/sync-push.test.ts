import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Bed, Stay, Unit } from '../../src/core/records.ts';
import { baseTimeMs, changeOf, demoAmendment, demoBed, demoHandover, demoRead, demoStay } from './fixtures.ts';
import { pullAll, push, statusesOf } from './sync-helpers.ts';
import type { Clinician, TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

const hourMs = 3_600_000;

describe('push', () => {
  let t: TestApp;
  let nurse: Clinician;
  let bed: Bed;
  let stay: Stay;

  beforeEach(async () => {
    t = await openTestApp();
    nurse = await t.clinician('nurse');
    bed = demoBed(t.unit.id);
    stay = demoStay(t.unit.id, bed.id);
    expect(statusesOf(await push(t.admin, [changeOf('bed.put', bed), changeOf('stay.put', stay)]))).toEqual(['accepted', 'accepted']);
  });
  afterEach(async () => {
    await t.close();
  });

  describe('reads', () => {
    it('accepts a read and derives its figures itself with the core, whatever the tablet sent', async () => {
      const read = demoRead(stay, nurse.user.id);
      const change = changeOf('read.sign', read);
      // A tablet that also sends figures of its own: they are not part of the record and are dropped.
      const withForgedFigures = { ...change, record: { ...read, derived: { rate: { rateBpm: 999 } } }, derived: { rateBpm: 999 } };
      const [result] = await push(nurse, [withForgedFigures]);
      expect(result).toEqual({ changeId: change.changeId, status: 'accepted', seq: 4 });
      const pulled = (await pullAll(nurse)).changes.find((c) => c.kind === 'read.sign');
      // 1500 / 20 small boxes = 75 bpm at 25 mm/s: common practice, no source (1500 rule, clinical-reference.md 2.x).
      expect(pulled?.derived?.rate.rateBpm).toBe(75);
      expect(pulled?.derived?.intervals).toEqual({ prMs: 160, qrsMs: 80, qtMs: 360 });
      expect(pulled?.coreVersion).toBe('1.0.0');
      expect(pulled?.record).toEqual(read);
    });

    it('answers a repeated push exactly as the first time and applies it once', async () => {
      const changes = [changeOf('read.sign', demoRead(stay, nurse.user.id)), changeOf('read.sign', demoRead(stay, nurse.user.id, { stripTimeMs: baseTimeMs + 4 * hourMs }))];
      const first = await push(nurse, changes);
      const again = await push(nurse, changes);
      const reordered = await push(nurse, [...changes].reverse());
      expect(again).toEqual(first);
      expect(reordered).toEqual([...first].reverse());
      expect((await pullAll(nurse)).changes.filter((c) => c.kind === 'read.sign')).toHaveLength(2);
    });

    it('rejects a read whose QT is longer than its R-R, naming the field in nurse words, and still takes the rest of the batch', async () => {
      const bad = changeOf('read.sign', demoRead(stay, nurse.user.id, { counts: { ...demoRead(stay, nurse.user.id).counts, rrSmallBoxes: [20], qtSmallBoxes: 21 } }));
      const good = changeOf('read.sign', demoRead(stay, nurse.user.id));
      const [badResult, goodResult] = await push(nurse, [bad, good]);
      expect(badResult?.status).toBe('rejected');
      expect(badResult?.errors?.map((e) => e.field)).toEqual(['record.counts.qtSmallBoxes']);
      expect(badResult?.reason).toBe('This read was not accepted: qtSmallBoxes (21) must be shorter than the R-R it sits in (longest R-R entered: 20 small boxes)');
      expect(badResult?.retryable).toBeUndefined();
      expect(goodResult?.status).toBe('accepted');
      expect(await push(nurse, [bad])).toEqual([badResult]);
    });

    it('names schema problems by their path in the change', async () => {
      const read = demoRead(stay, nurse.user.id);
      const change = changeOf('read.sign', { ...read, counts: { ...read.counts, paperSpeedMmPerS: 30 as 25 } });
      const [result] = await push(nurse, [change]);
      expect(result?.errors).toEqual([{ field: 'record.counts.paperSpeedMmPerS', message: 'record.counts.paperSpeedMmPerS: paperSpeedMmPerS must be 25 or 50 (mm/s)' }]);
    });

    it('keeps both reads when two tablets read the same bed at the same minute', async () => {
      const tabletB = await t.enrollDevice('Tablet B');
      const other = await t.clinician('nurse', { deviceToken: tabletB });
      const mine = demoRead(stay, nurse.user.id, { deviceId: 'tablet-a' });
      const theirs = demoRead(stay, other.user.id, { deviceId: 'tablet-b' });
      await Promise.all([push(nurse, [changeOf('read.sign', mine)]), push(other, [changeOf('read.sign', theirs)])]);
      const reads = (await pullAll(nurse)).changes.filter((c) => c.kind === 'read.sign').map((c) => c.record.id);
      expect(reads.sort()).toEqual([mine.id, theirs.id].sort());
    });

    it('accepts a re-signed copy of a stored read under a new change id as the same read, and refuses a changed copy', async () => {
      const read = demoRead(stay, nurse.user.id);
      const [first] = await push(nurse, [changeOf('read.sign', read)]);
      const [copy] = await push(nurse, [changeOf('read.sign', read)]);
      const [changed] = await push(nurse, [changeOf('read.sign', { ...read, notes: 'edited after signing' })]);
      expect(copy?.seq).toBe(first?.seq);
      expect(changed?.status).toBe('rejected');
      expect(changed?.reason).toMatch(/add an amendment instead/);
    });

    it('compares with the previous read by strip time on the server, flagging a QTc rise since the last read', async () => {
      const earlier = demoRead(stay, nurse.user.id, { stripTimeMs: baseTimeMs });
      // QT 12 small boxes (480 ms) at R-R 800 ms: Fridericia QTc 515 ms against 388 ms before, a rise of 127 ms (> 60 ms, Drew et al. 2010).
      const later = demoRead(stay, nurse.user.id, { stripTimeMs: baseTimeMs + 4 * hourMs, counts: { ...earlier.counts, qtSmallBoxes: 12 } });
      await push(nurse, [changeOf('read.sign', later), changeOf('read.sign', earlier)]);
      const pulled = (await pullAll(nurse)).changes.filter((c) => c.kind === 'read.sign');
      const laterFlags = pulled.find((c) => c.record.id === later.id)?.derived?.flags.map((f) => f.code) ?? [];
      // Arrived first, so on receipt it had no earlier read to compare with.
      expect(laterFlags).not.toContain('qtc-rise-since-last-read');
      const again = demoRead(stay, nurse.user.id, { stripTimeMs: baseTimeMs + 8 * hourMs, counts: { ...earlier.counts, qtSmallBoxes: 12 } });
      const third = demoRead(stay, nurse.user.id, { stripTimeMs: baseTimeMs + 2 * hourMs, counts: { ...earlier.counts, qtSmallBoxes: 12 } });
      await push(nurse, [changeOf('read.sign', third), changeOf('read.sign', again)]);
      const thirdFlags = (await pullAll(nurse)).changes.find((c) => c.record.id === third.id)?.derived?.flags.map((f) => f.code);
      expect(thirdFlags).toContain('qtc-rise-since-last-read');
    });

    it('derives with the unit policy in force: a unit QTc default of Bazett changes the figure used for flags', async () => {
      const unitRecord = (await pullAll(t.admin)).changes.find((c) => c.kind === 'unit.put')?.record;
      const override = { key: 'defaultQtcFormula' as const, value: 'bazett' as const, changedBy: 'A. Admin', changedAtMs: baseTimeMs, reason: 'Unit protocol uses Bazett' };
      const [policy] = await push(t.admin, [changeOf('unit.put', { ...(unitRecord as unknown as Unit), policyOverrides: [override] })]);
      expect(policy?.status).toBe('accepted');
      await push(nurse, [changeOf('read.sign', demoRead(stay, nurse.user.id))]);
      const derived = (await pullAll(nurse)).changes.find((c) => c.kind === 'read.sign')?.derived;
      expect(derived?.defaultQtcFormula).toBe('bazett');
      // Bazett: 360 / sqrt(0.8) = 402.5 ms (Bazett 1920; clinical-reference.md section 3).
      expect(derived?.qtc?.forFlags.qtcMs).toBeCloseTo(402.49, 1);
    });

    it('rejects a read for a stay the server has not seen, without remembering, and accepts it once the stay arrives', async () => {
      const laterStay = demoStay(t.unit.id, bed.id, { alias: 'M.P.' });
      const read = changeOf('read.sign', demoRead(laterStay, nurse.user.id));
      const [early] = await push(nurse, [read]);
      expect(early).toMatchObject({ status: 'rejected', retryable: true, errors: [{ field: 'record.stayId' }] });
      const results = await push(nurse, [changeOf('stay.put', laterStay), read]);
      expect(statusesOf(results)).toEqual(['accepted', 'accepted']);
    });

    it('refuses a change that belongs to another unit', async () => {
      const [result] = await push(nurse, [changeOf('read.sign', demoRead({ ...stay, unitId: 'another-unit-id' }, nurse.user.id))]);
      expect(result).toMatchObject({ status: 'rejected', errors: [{ field: 'record.unitId' }] });
    });
  });

  describe('authors on a shared tablet', () => {
    it('accepts a read entered offline by a colleague who has signed in on this tablet, and audits who pushed it', async () => {
      const colleague = await t.clinician('nurse');
      const read = demoRead(stay, colleague.user.id);
      const [result] = await push(nurse, [changeOf('read.sign', read)]);
      expect(result?.status).toBe('accepted');
      const event = (await t.store.listAudit({ unitId: t.unit.id, kind: 'read.signed', limit: 1 }))[0];
      expect([event?.userId, event?.detail]).toEqual([colleague.user.id, `pushed by ${nurse.user.username}`]);
    });

    it('holds back (retryable) a read by a colleague who never signed in on this tablet', async () => {
      const tabletB = await t.enrollDevice('Tablet B');
      const elsewhere = await t.clinician('nurse', { deviceToken: tabletB });
      const [result] = await push(nurse, [changeOf('read.sign', demoRead(stay, elsewhere.user.id))]);
      expect(result).toMatchObject({ status: 'rejected', retryable: true, errors: [{ field: 'record.authorId' }] });
    });

    it('refuses a read naming an author who has no account on the unit', async () => {
      const [result] = await push(nurse, [changeOf('read.sign', demoRead(stay, 'ghost-author-id'))]);
      expect(result).toMatchObject({ status: 'rejected', errors: [{ field: 'record.authorId' }] });
      expect(result?.retryable).toBeUndefined();
    });
  });

  describe('amendments', () => {
    it('adds an amendment beside the read, never editing it, and derives the amended figures', async () => {
      const read = demoRead(stay, nurse.user.id);
      await push(nurse, [changeOf('read.sign', read)]);
      const amendment = demoAmendment(read, nurse.user.id, { qtSmallBoxes: 10 });
      const [result] = await push(nurse, [changeOf('amendment.add', amendment)]);
      expect(result?.status).toBe('accepted');
      const pulled = (await pullAll(nurse)).changes;
      expect(pulled.find((c) => c.kind === 'read.sign')?.record).toEqual(read);
      expect(pulled.find((c) => c.kind === 'read.sign')?.derived?.intervals.qtMs).toBe(360);
      expect(pulled.find((c) => c.kind === 'amendment.add')?.derived?.intervals.qtMs).toBe(400);
      expect((await t.store.inUnitTransaction(t.unit.id, (tx) => tx.getRead(read.id)))?.read.counts.qtSmallBoxes).toBe(9);
    });

    it('refuses an amendment by another nurse and accepts one by a unit admin', async () => {
      const read = demoRead(stay, nurse.user.id);
      await push(nurse, [changeOf('read.sign', read)]);
      const colleague = await t.clinician('charge-nurse');
      const [refused] = await push(colleague, [changeOf('amendment.add', demoAmendment(read, colleague.user.id, { notes: 'not mine to change' }))]);
      expect(refused).toMatchObject({ status: 'rejected', reason: 'Only the author of this read or a unit admin can amend it.', errors: [{ field: 'record.authorId' }] });
      const [byAdmin] = await push(t.admin, [changeOf('amendment.add', demoAmendment(read, t.admin.user.id, { notes: 'corrected by unit admin' }))]);
      expect(byAdmin?.status).toBe('accepted');
    });

    it('applies amendments in server order even when a tablet clock puts the later one first', async () => {
      const read = demoRead(stay, nurse.user.id);
      await push(nurse, [changeOf('read.sign', read)]);
      const first = demoAmendment(read, nurse.user.id, { qtSmallBoxes: 10 }, { createdAtMs: baseTimeMs + 6 * hourMs });
      const second = demoAmendment(read, nurse.user.id, { qtSmallBoxes: 11 }, { createdAtMs: baseTimeMs });
      await push(nurse, [changeOf('amendment.add', first)]);
      await push(nurse, [changeOf('amendment.add', second)]);
      const amendments = (await pullAll(nurse)).changes.filter((c) => c.kind === 'amendment.add');
      expect(amendments.map((a) => a.derived?.intervals.qtMs)).toEqual([400, 440]);
    });

    it('rejects an amendment that makes the counts impossible, naming the amended field', async () => {
      const read = demoRead(stay, nurse.user.id);
      await push(nurse, [changeOf('read.sign', read)]);
      const [result] = await push(nurse, [changeOf('amendment.add', demoAmendment(read, nurse.user.id, { qtSmallBoxes: 25 }))]);
      expect(result?.errors?.map((e) => e.field)).toEqual(['record.changes.qtSmallBoxes']);
    });

    it('holds back an amendment whose read has not arrived (retryable)', async () => {
      const read = demoRead(stay, nurse.user.id);
      const [result] = await push(nurse, [changeOf('amendment.add', demoAmendment(read, nurse.user.id, { notes: 'x' }))]);
      expect(result).toMatchObject({ status: 'rejected', retryable: true, errors: [{ field: 'record.readId' }] });
    });
  });

  describe('stays, beds, handovers and unit settings', () => {
    it('resolves stay edits from two tablets in server order and keeps every version', async () => {
      const fromA = changeOf('stay.put', { ...stay, qtProlongingDrugs: 'drug A', updatedAtMs: baseTimeMs + 9 * hourMs }, baseTimeMs + 9 * hourMs);
      const fromB = changeOf('stay.put', { ...stay, qtProlongingDrugs: 'drug B', updatedAtMs: baseTimeMs + hourMs }, baseTimeMs + hourMs);
      await push(nurse, [fromA]);
      await push(t.admin, [fromB]);
      const current = await t.store.inUnitTransaction(t.unit.id, (tx) => tx.getStay(stay.id));
      expect(current?.qtProlongingDrugs).toBe('drug B');
      const versions = (await pullAll(nurse)).changes.filter((c) => c.kind === 'stay.put').map((c) => c.record.qtProlongingDrugs);
      expect(versions).toEqual(['', 'drug A', 'drug B']);
    });

    it('lets only charge nurses and unit admins change beds', async () => {
      const [byNurse] = await push(nurse, [changeOf('bed.put', demoBed(t.unit.id, 'Bed 9'))]);
      const charge = await t.clinician('charge-nurse');
      const [byCharge] = await push(charge, [changeOf('bed.put', demoBed(t.unit.id, 'Bed 9'))]);
      expect([byNurse?.status, byCharge?.status]).toEqual(['rejected', 'accepted']);
    });

    it('records a handover given, then received by another nurse', async () => {
      const receiver = await t.clinician('nurse');
      const handover = demoHandover(stay, nurse.user.id);
      expect((await push(nurse, [changeOf('handover.put', handover)]))[0]?.status).toBe('accepted');
      const received = { ...handover, receivedById: receiver.user.id, receivedByName: 'Clinician', receivedAtMs: baseTimeMs + 12 * hourMs + 600_000 };
      expect((await push(receiver, [changeOf('handover.put', received)]))[0]?.status).toBe('accepted');
      const kinds = (await t.store.listAudit({ unitId: t.unit.id, limit: 50 })).map((e) => e.kind);
      expect(kinds).toEqual(expect.arrayContaining(['handover.given', 'handover.received']));
    });

    it('lets only a unit admin change the unit, and keeps earlier policy changes as history', async () => {
      const unitRecord = (await pullAll(t.admin)).changes.find((c) => c.kind === 'unit.put')?.record as unknown as Unit;
      const [byNurse] = await push(nurse, [changeOf('unit.put', { ...unitRecord, readIntervalHours: 2 })]);
      expect(byNurse?.status).toBe('rejected');
      const change1 = { key: 'qtcHighRiskMs' as const, value: 480, changedBy: 'A. Admin', changedAtMs: baseTimeMs, reason: 'Unit protocol escalates at 480 ms' };
      expect((await push(t.admin, [changeOf('unit.put', { ...unitRecord, policyOverrides: [change1] })]))[0]?.status).toBe('accepted');
      const [rewrite] = await push(t.admin, [changeOf('unit.put', { ...unitRecord, policyOverrides: [{ ...change1, value: 470 }] })]);
      expect(rewrite).toMatchObject({ status: 'rejected', errors: [{ field: 'record.policyOverrides' }] });
      const event = (await t.store.listAudit({ unitId: t.unit.id, kind: 'policy.changed', limit: 5 }))[0];
      expect(event?.detail).toBe('changed policyOverrides; policy: qtcHighRiskMs');
    });
  });

  describe('whole-body refusals (400, field-named)', () => {
    const cases: Array<[string, unknown, string]> = [
      ['a list instead of an object', [], 'body'],
      ['no changes array', { change: [] }, 'changes'],
      ['changes that is not a list', { changes: 'all of them' }, 'changes'],
      ['an unexpected top-level field', { changes: [], extra: 1 }, 'body'],
    ];
    for (const [what, body, field] of cases) {
      it(`refuses ${what}, naming ${field}`, async () => {
        const answer = await nurse.post('/api/sync/push', body);
        expect(answer.statusCode).toBe(400);
        expect((answer.json() as { errors: Array<{ field: string }> }).errors.map((e) => e.field)).toEqual([field]);
      });
    }

    it('refuses more than 200 changes in one push, with the limit', async () => {
      const answer = await nurse.post('/api/sync/push', { changes: Array.from({ length: 201 }, () => ({})) });
      expect(answer.statusCode).toBe(400);
      expect(answer.json()).toEqual({ errors: [{ field: 'changes', max: 200, message: 'changes: at most 200 changes in one push; got 201. Send the rest in the next push.' }] });
    });

    it('answers an empty push with no results', async () => {
      expect(await push(nurse, [])).toEqual([]);
    });
  });
});
