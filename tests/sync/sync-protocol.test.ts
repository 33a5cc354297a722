import { describe, expect, it } from 'vitest';
import { pullResponseSchema, pushResponseSchema } from '../../src/sync/sync-protocol.ts';
import { bed, t0, unit } from './sync-fixtures.ts';

describe('pullResponseSchema', () => {
  it('reads a cursor of digits as a seq, whether sent as text or number', () => {
    expect(pullResponseSchema.parse({ changes: [], cursor: '42', hasMore: false }).cursor).toBe(42);
    expect(pullResponseSchema.parse({ changes: [], cursor: 42, hasMore: false }).cursor).toBe(42);
    expect(pullResponseSchema.parse({ changes: [], cursor: 'opaque-7', hasMore: false }).cursor).toBe('opaque-7');
  });

  it('takes a change with extra fields the tablet does not use, and keeps its change id for the check at the cursor', () => {
    const parsed = pullResponseSchema.parse({ changes: [{ seq: 3, changeId: 'c-00000003', kind: 'bed.put', record: bed, serverTimeMs: t0, deviceTimeMs: t0 }], cursor: '3', hasMore: false });
    expect(parsed.changes[0]).toEqual({ seq: 3, changeId: 'c-00000003', kind: 'bed.put', record: bed, serverTimeMs: t0 });
  });

  it('refuses a record that breaks the shared schema, a seq of 0, and an unknown kind', () => {
    expect(pullResponseSchema.safeParse({ changes: [{ seq: 1, kind: 'unit.put', record: { ...unit, readIntervalHours: 30 }, serverTimeMs: t0 }], cursor: 1, hasMore: false }).success).toBe(false);
    expect(pullResponseSchema.safeParse({ changes: [{ seq: 0, kind: 'bed.put', record: bed, serverTimeMs: t0 }], cursor: 0, hasMore: false }).success).toBe(false);
    expect(pullResponseSchema.safeParse({ changes: [{ seq: 1, kind: 'bed.delete', record: bed, serverTimeMs: t0 }], cursor: 1, hasMore: false }).success).toBe(false);
  });

  it('refuses server figures without the fields the tablet shows', () => {
    const read = { seq: 4, kind: 'read.sign', serverTimeMs: t0, derived: { coreVersion: '1.0.0' }, record: {} };
    expect(pullResponseSchema.safeParse({ changes: [read], cursor: 4, hasMore: false }).success).toBe(false);
  });
});

describe('pushResponseSchema', () => {
  it('takes per-change answers, including a refusal that may pass later', () => {
    const parsed = pushResponseSchema.parse({ results: [
      { changeId: 'c-1-000000', status: 'accepted', seq: 9 },
      { changeId: 'c-2-000000', status: 'rejected', reason: 'later', errors: [{ field: 'record.stayId', message: 'unknown stay' }], retryable: true },
      { changeId: null, status: 'rejected', reason: 'not a change' },
    ] });
    expect(parsed.results.map((r) => r.status)).toEqual(['accepted', 'rejected', 'rejected']);
    expect(parsed.results[1]?.retryable).toBe(true);
  });

  it('refuses an answer status other than accepted or rejected, and a fractional seq', () => {
    expect(pushResponseSchema.safeParse({ results: [{ changeId: 'c', status: 'ok' }] }).success).toBe(false);
    expect(pushResponseSchema.safeParse({ results: [{ changeId: 'c', status: 'accepted', seq: 1.5 }] }).success).toBe(false);
  });
});
