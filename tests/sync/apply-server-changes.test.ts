import { describe, expect, it } from 'vitest';
import { amendRead } from '../../src/store/amend-read.ts';
import { updateStay } from '../../src/store/stays.ts';
import { analysisSourceForPulledRead, decidePulledPut, waitingEditKeys } from '../../src/sync/apply-server-changes.ts';
import type { ReadAnalysis } from '../../src/core/analyze-read.ts';
import type { OutboxRow } from '../../src/store/db.ts';
import { ManualClock, hourMs, newServer, newTablet, nurseAsh, nurseBay, pushThenPull, signInTablet, signReadAt, stay, t0 } from './sync-fixtures.ts';

describe('decidePulledPut', () => {
  it('applies a version newer than any the tablet knows when no local edit waits', () => {
    expect(decidePulledPut(7, undefined, false)).toBe('apply');
    expect(decidePulledPut(7, 6, false)).toBe('apply');
  });

  it('ignores a version no newer than one already held (a repeated or older page)', () => {
    expect(decidePulledPut(6, 6, false)).toBe('already-newer');
    expect(decidePulledPut(5, 6, true)).toBe('already-newer');
  });

  it('holds a newer version back while this tablet has its own edit of the record waiting to send', () => {
    expect(decidePulledPut(7, 6, true)).toBe('hold');
    expect(decidePulledPut(1, undefined, true)).toBe('hold');
  });
});

describe('analysisSourceForPulledRead', () => {
  const derived = { coreVersion: '1.0.0' } as ReadAnalysis;
  it('takes the server figures for a read without amendments on this tablet', () => {
    expect(analysisSourceForPulledRead(derived, 0)).toBe('server');
  });
  it('derives on the tablet when it holds amendments the sign-time figures lack, or the server sent none', () => {
    expect(analysisSourceForPulledRead(derived, 1)).toBe('tablet');
    expect(analysisSourceForPulledRead(undefined, 0)).toBe('tablet');
    expect(analysisSourceForPulledRead(null, 0)).toBe('tablet');
  });
});

describe('waitingEditKeys', () => {
  it('lists records with a pending or interrupted change, not answered ones', () => {
    const row = (status: OutboxRow['status'], id: string) => ({ status, kind: 'stay.put', change: { record: { id } } }) as unknown as OutboxRow;
    expect([...waitingEditKeys([row('pending', 'a'), row('sending', 'b'), row('accepted', 'c'), row('rejected', 'd')])]).toEqual(['stay.put:a', 'stay.put:b']);
  });
});

describe('applying pulled stays', () => {
  async function twoTablets() {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const tabletA = await newTablet();
    const tabletB = await newTablet();
    await signInTablet(tabletA, server, nurseAsh.id);
    await signInTablet(tabletB, server, nurseBay.id);
    await pushThenPull(tabletA, server, clock);
    await pushThenPull(tabletB, server, clock);
    return { server, clock, tabletA, tabletB };
  }

  it('resolves two tablets editing one stay in server order, even when the later edit carries a device time 6 h earlier', async () => {
    const { server, clock, tabletA, tabletB } = await twoTablets();
    await updateStay(tabletA, { ...stay, notes: 'Potassium replaced (edit from tablet A)' }, t0 + hourMs);
    // Tablet B's clock runs 6 h slow: its edit says it was made hours before tablet A's.
    await updateStay(tabletB, { ...stay, qtProlongingDrugs: 'ondansetron (edit from tablet B)' }, t0 + 2 * hourMs - 6 * hourMs);
    await pushThenPull(tabletA, server, clock);
    await pushThenPull(tabletB, server, clock);
    await pushThenPull(tabletA, server, clock);
    const stayPuts = server.log.filter((l) => l.kind === 'stay.put');
    // The server keeps the history: set-up, A's edit, B's edit, in the order they arrived.
    expect(stayPuts.map((l) => l.deviceTimeMs)).toEqual([stay.updatedAtMs, t0 + hourMs, t0 - 4 * hourMs]);
    for (const db of [tabletA, tabletB]) {
      const held = await db.stays.get(stay.id);
      expect(held?.qtProlongingDrugs).toBe('ondansetron (edit from tablet B)');
      // Tablet B's edit was made from the version it held, so A's note is not in the winning version.
      expect(held?.notes).toBe('');
      // The device time stays in the record as data.
      expect(held?.updatedAtMs).toBe(t0 - 4 * hourMs);
    }
  });

  it('never writes a pulled version over a stay edit still waiting to send, and the edit wins once pushed', async () => {
    const { server, clock, tabletA, tabletB } = await twoTablets();
    await updateStay(tabletA, { ...stay, notes: 'first (tablet A)' }, t0 + hourMs);
    await pushThenPull(tabletA, server, clock);
    // Tablet B edits offline, then pulls before it can push (say the push failed).
    await updateStay(tabletB, { ...stay, notes: 'second (tablet B)' }, t0 + 2 * hourMs);
    const { pullChanges } = await import('../../src/sync/pull-changes.ts');
    const { credentialsOf } = await import('../../src/sync/server-session.ts');
    const { connectionTo } = await import('./sync-fixtures.ts');
    const summary = await pullChanges(tabletB, connectionTo(server, clock), (await credentialsOf(tabletB))!, stay.unitId);
    expect(summary.held).toBe(1);
    expect((await tabletB.stays.get(stay.id))?.notes).toBe('second (tablet B)');
    await pushThenPull(tabletB, server, clock);
    await pushThenPull(tabletA, server, clock);
    expect((await tabletA.stays.get(stay.id))?.notes).toBe('second (tablet B)');
    expect((await tabletB.stays.get(stay.id))?.notes).toBe('second (tablet B)');
  });

  it('returns a refused stay edit to the version the server holds, keeping the refused edit and its reason in the outbox', async () => {
    const { server, clock, tabletA, tabletB } = await twoTablets();
    await updateStay(tabletA, { ...stay, notes: 'accepted note (tablet A)' }, t0 + hourMs);
    await pushThenPull(tabletA, server, clock);
    await updateStay(tabletB, { ...stay, alias: 'X.X.' }, t0 + 2 * hourMs);
    server.rejectWhen = (change) => (change.kind === 'stay.put' && change.record.alias === 'X.X.' ? 'Only a charge nurse may change the alias.' : null);
    // B pulls A's note while its own edit still waits (held back), then its push is refused.
    const { pullChanges } = await import('../../src/sync/pull-changes.ts');
    const { pushOutbox } = await import('../../src/sync/push-outbox.ts');
    const { credentialsOf } = await import('../../src/sync/server-session.ts');
    const { connectionTo } = await import('./sync-fixtures.ts');
    const credentials = (await credentialsOf(tabletB))!;
    expect((await pullChanges(tabletB, connectionTo(server, clock), credentials, stay.unitId)).held).toBe(1);
    expect((await tabletB.stays.get(stay.id))?.alias).toBe('X.X.');
    expect(await pushOutbox(tabletB, connectionTo(server, clock), credentials)).toMatchObject({ rejected: 1 });
    const shown = await tabletB.stays.get(stay.id);
    expect(shown).toMatchObject({ alias: stay.alias, notes: 'accepted note (tablet A)' });
    const refused = (await tabletB.outbox.toArray()).find((r) => r.status === 'rejected');
    expect(refused).toMatchObject({ kind: 'stay.put', rejectReason: 'Only a charge nurse may change the alias.' });
    expect((refused?.change.record as { alias: string }).alias).toBe('X.X.');
  });
});

describe('applying pulled amendments', () => {
  it('re-derives the read on the other tablet with the core, so both show the amended QTc', async () => {
    const server = await newServer();
    const clock = new ManualClock(t0);
    const tabletA = await newTablet();
    const tabletB = await newTablet();
    await signInTablet(tabletA, server, nurseAsh.id);
    await signInTablet(tabletB, server, nurseBay.id);
    const read = await signReadAt(tabletA, t0);
    await pushThenPull(tabletA, server, clock);
    await pushThenPull(tabletB, server, clock);
    const { unit } = await import('./sync-fixtures.ts');
    await amendRead(tabletA, { unit, stay, readId: read.id, changes: { qtSmallBoxes: 11 }, reason: 'Recounted the QT on the strip', author: { id: nurseAsh.id, name: nurseAsh.name }, deviceId: 'tablet-a', nowMs: t0 + hourMs });
    await pushThenPull(tabletA, server, clock);
    await pushThenPull(tabletB, server, clock);
    // QT 11 boxes = 440 ms at R-R 800 ms: Fridericia 440 / 0.8^(1/3) = 474.0 ms (Fridericia 1920, Die Systolendauer im Elektrokardiogramm).
    for (const db of [tabletA, tabletB]) {
      expect((await db.reads.get(read.id))?.analysis?.qtc?.byFormula.fridericia).toBeCloseTo(474.0, 1);
      expect(await db.amendments.count()).toBe(1);
      expect((await db.amendments.toArray())[0]?.syncStatus).toBe('accepted');
    }
    expect(server.amendments.size).toBe(1);
  });
});
