import { describe, expect, it } from 'vitest';
import { currentReadView, deriveRead, previousFiguresOf, readInputFor } from '../../src/core/read-derivation.ts';
import type { Amendment, SignedRead, Stay } from '../../src/core/records.ts';
import { changeSchema, signedReadSchema } from '../../src/core/records.ts';
import { applyPolicyOverrides, defaultPolicy } from '../../src/core/unit-policy.ts';

const stay: Stay = {
  id: 'stay-0001', unitId: 'unit-0001', bedId: 'bed-00001', alias: 'J.K.', sex: 'female', paced: false, bundleBranchBlock: false,
  qtProlongingDrugs: 'sotalol', baselineQtcMs: 430, notes: '', startMs: 0, endMs: null, updatedAtMs: 0, updatedBy: 'nurse',
};
const read: SignedRead = {
  id: 'read-00000001', unitId: 'unit-0001', bedId: 'bed-00001', stayId: 'stay-0001', stripTimeMs: 1000, enteredAtMs: 1000, signedAtMs: 1000,
  authorId: 'nurse-001', authorName: 'A. Nurse', deviceId: 'tablet-1', reason: 'routine',
  counts: { paperSpeedMmPerS: 25, gainMmPerMv: 10, rrSmallBoxes: [20, 20], ppSmallBoxes: [], qtSmallBoxes: 12, prSmallBoxes: 4, qrsSmallBoxes: 2, avBlockNoted: false, rhythmLabel: 'sinus-rhythm' },
};

describe('deriving a stored read', () => {
  it('builds the analysis input from counts and the stay', () => {
    expect(readInputFor(read.counts, stay)).toMatchObject({ sex: 'female', baselineQtcMs: 430, qtSmallBoxes: 12, paced: false });
  });
  it('derives QTc and the rise from baseline: QT 480 ms at R-R 800 ms is Fridericia 517 (Fridericia 1920), a rise of 87 ms (Drew et al. 2010: > 60)', () => {
    const result = deriveRead(read, stay, undefined, defaultPolicy);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.value.qtc?.byFormula.fridericia).toBeCloseTo(480 / Math.cbrt(0.8), 9);
    expect(result.value.flags.map((f) => f.code)).toEqual(['qtc-high-risk', 'qtc-rise-from-baseline']);
    expect(previousFiguresOf(result.value)).toEqual({ rateBpm: 75, prMs: 160, qrsMs: 80, qtcMs: result.value.qtc!.forFlags.qtcMs, qtcFormula: 'fridericia' });
  });
  it('refuses stored counts that fail validation, naming the field', () => {
    const bad = { ...read, counts: { ...read.counts, qtSmallBoxes: 30 } };
    const result = deriveRead(bad, stay, undefined, defaultPolicy);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors[0]?.field).toBe('qtSmallBoxes');
  });
});

describe('amendments', () => {
  const amendment = (id: string, createdAtMs: number, changes: Amendment['changes']): Amendment => ({
    id, readId: read.id, unitId: read.unitId, stayId: read.stayId, changes, reason: 'Recounted on the monitor', authorId: 'nurse-001', authorName: 'A. Nurse', deviceId: 'tablet-1', createdAtMs,
  });
  it('applies amendments in time order to a copy and keeps the original readable', () => {
    const view = currentReadView(read, [amendment('am-000002', 3000, { qtSmallBoxes: 10 }), amendment('am-000001', 2000, { qtSmallBoxes: 11, notes: 'recount' })]);
    expect(view.current.counts.qtSmallBoxes).toBe(10);
    expect(view.current.notes).toBe('recount');
    expect(view.read.counts.qtSmallBoxes).toBe(12);
    expect(read.counts.qtSmallBoxes).toBe(12);
    expect(view.amendments.map((a) => a.id)).toEqual(['am-000001', 'am-000002']);
    expect(view.changedFields.sort()).toEqual(['notes', 'qtSmallBoxes']);
  });
  it('ignores amendments of other reads', () => {
    const other = { ...amendment('am-000003', 1, { qtSmallBoxes: 5 }), readId: 'read-other-1' };
    expect(currentReadView(read, [other]).current.counts.qtSmallBoxes).toBe(12);
  });
});

describe('records and policy', () => {
  it('validates a signed read and a change with the shared schemas', () => {
    expect(signedReadSchema.safeParse(read).success).toBe(true);
    expect(changeSchema.safeParse({ changeId: 'chg-00000001', kind: 'read.sign', deviceTimeMs: 5, record: read }).success).toBe(true);
    expect(changeSchema.safeParse({ changeId: 'chg-00000001', kind: 'read.delete', deviceTimeMs: 5, record: read }).success).toBe(false);
  });
  it('applies policy overrides in order, later changes winning, with who and why in the source', () => {
    const policy = applyPolicyOverrides(defaultPolicy, [
      { key: 'qtcHighRiskMs', value: 520, changedBy: 'Dr L.M.', changedAtMs: 1, reason: 'cardiology ward protocol' },
      { key: 'qtcHighRiskMs', value: 510, changedBy: 'Dr L.M.', changedAtMs: 2, reason: 'revised' },
      { key: 'defaultQtcFormula', value: 'framingham', changedBy: 'Dr L.M.', changedAtMs: 3, reason: 'unit choice' },
    ]);
    expect(policy.thresholds.qtcHighRiskMs.value).toBe(510);
    expect(policy.thresholds.qtcHighRiskMs.severity).toBe('urgent');
    expect(policy.thresholds.qtcHighRiskMs.source).toBe('unit setting changed by Dr L.M.: revised');
    expect(policy.defaultQtcFormula).toBe('framingham');
    expect(defaultPolicy.thresholds.qtcHighRiskMs.value).toBe(500);
  });
  it('names a published source for every default limit', () => {
    for (const t of Object.values(defaultPolicy.thresholds)) expect(t.source).toMatch(/\d{4}|common practice/i);
  });
});
