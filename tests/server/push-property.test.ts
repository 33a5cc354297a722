import { randomUUID } from 'node:crypto';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FieldError } from '../../src/core/field-error.ts';
import type { Change } from '../../src/core/records.ts';
import type { ChangeResult } from '../../src/server/sync/change-result.ts';
import { changeOf, demoAmendment, demoBed, demoHandover, demoRead, demoStay } from './fixtures.ts';
import { push } from './sync-helpers.ts';
import type { TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
type Path = Array<string | number>;

/** Every leaf (string, number, boolean, null) of a JSON value, with its path. */
function leavesOf(value: Json, path: Path = []): Array<{ path: Path; value: Json }> {
  if (value === null || typeof value !== 'object') return [{ path, value }];
  const entries: Array<[string | number, Json]> = Array.isArray(value) ? value.map((v, i) => [i, v]) : Object.entries(value);
  return entries.flatMap(([key, v]) => leavesOf(v, [...path, key]));
}

function setAt(value: Json, path: Path, replacement: Json | undefined): Json {
  const copy = structuredClone(value) as Record<string | number, Json>;
  let node = copy;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string | number, Json>;
  const last = path.at(-1) as string | number;
  if (replacement === undefined) delete node[last];
  else node[last] = replacement;
  return copy as Json;
}

/** A value of another JSON type than the leaf's, so the field can never stay valid (null is never replaced by a number: some times are nullable numbers). */
function wrongTypeFor(leaf: Json): fc.Arbitrary<Json> {
  const pools: Array<fc.Arbitrary<Json>> = [];
  if (typeof leaf !== 'string') pools.push(fc.string({ maxLength: 12 }));
  if (typeof leaf !== 'number' && leaf !== null) pools.push(fc.oneof(fc.integer(), fc.double({ noNaN: true, noDefaultInfinity: true })));
  if (typeof leaf !== 'boolean') pools.push(fc.boolean());
  if (leaf !== null) pools.push(fc.constant(null));
  pools.push(fc.constant([] as Json[]), fc.dictionary(fc.string({ maxLength: 5 }), fc.integer(), { maxKeys: 2 }));
  return fc.oneof(...pools);
}

/** Fields every change must carry (deleting one always makes the change invalid). */
const requiredPaths: Path[] = [['changeId'], ['kind'], ['deviceTimeMs'], ['record'], ['record', 'id'], ['record', 'unitId']];

describe('10,000 malformed pushes', () => {
  let t: TestApp;
  let bases: Json[];
  beforeAll(async () => {
    t = await openTestApp();
    const bed = demoBed(t.unit.id);
    const stay = demoStay(t.unit.id, bed.id);
    const read = demoRead(stay, t.admin.user.id);
    await push(t.admin, [changeOf('bed.put', bed), changeOf('stay.put', stay), changeOf('read.sign', read)]);
    const valid: Change[] = [
      changeOf('read.sign', demoRead(stay, t.admin.user.id, { reasonText: 'scheduled', notes: 'n' })),
      changeOf('stay.put', demoStay(t.unit.id, bed.id, { baselineQtcMs: 420, ageYears: 70, recordNumber: 'R-1' })),
      changeOf('amendment.add', demoAmendment(read, t.admin.user.id, { qtSmallBoxes: 10, notes: 'x' })),
      changeOf('handover.put', demoHandover(stay, t.admin.user.id, { coveredRecordIds: [read.id] })),
      changeOf('bed.put', demoBed(t.unit.id, 'Bed 2')),
    ];
    bases = valid.map((c) => JSON.parse(JSON.stringify(c)) as Json);
  });
  afterAll(async () => {
    await t.close();
  });

  const withFreshId = (change: Json): Json => (change && typeof change === 'object' && !Array.isArray(change) && typeof change.changeId === 'string' ? { ...change, changeId: randomUUID() } : change);

  /** One malformed change: a leaf of the wrong type, a negative number, a missing required field, or not a change at all. */
  const malformedChange = (): fc.Arbitrary<Json> =>
    fc.nat({ max: bases.length - 1 }).chain((i) => {
      const base = bases[i] as Json;
      const leaves = leavesOf(base);
      const numericLeaves = leaves.filter((l) => typeof l.value === 'number');
      return fc.oneof(
        fc.constantFrom(...leaves).chain((leaf) => wrongTypeFor(leaf.value).map((v) => setAt(base, leaf.path, v))),
        fc.tuple(fc.constantFrom(...numericLeaves), fc.integer({ min: 1, max: 1e9 })).map(([leaf, n]) => setAt(base, leaf.path, -n)),
        fc.constantFrom(...requiredPaths).map((path) => setAt(base, path, undefined)),
        fc.oneof(fc.string({ maxLength: 8 }), fc.integer(), fc.constant(null), fc.array(fc.integer(), { maxLength: 3 })) as fc.Arbitrary<Json>,
        fc.string({ maxLength: 12 }).map((kind) => setAt(base, ['kind'], `x-${kind}`)),
      );
    });

  /** A body the push endpoint must refuse as a whole. */
  const malformedBody: fc.Arbitrary<Json> = fc.oneof(
    fc.jsonValue({ maxDepth: 2 }).filter((v) => !(v !== null && typeof v === 'object' && !Array.isArray(v) && Array.isArray((v as { changes?: unknown }).changes))) as fc.Arbitrary<Json>,
    fc.jsonValue({ maxDepth: 1 }).filter((v) => !Array.isArray(v)).map((changes) => ({ changes }) as Json),
    fc.string({ minLength: 1, maxLength: 6 }).filter((k) => k !== 'changes' && k !== '__proto__').map((k) => ({ changes: [], [k]: 1 })),
    fc.constant({ changes: Array.from({ length: 201 }, () => 0) }),
  );

  const expectFieldNamed = (errors: FieldError[] | undefined) => {
    expect(errors?.length).toBeGreaterThan(0);
    for (const e of errors ?? []) {
      expect(e.field.length).toBeGreaterThan(0);
      const name = (e.field.split('.').at(-1) ?? e.field).replace(/\[\d+\]$/, '');
      expect(e.message).toContain(name);
    }
  };

  it('answers only 4xx with field-named errors, or 200 with every change rejected by field; never a 500', async () => {
    let wholeBodyRefusals = 0;
    let perChangeRefusals = 0;
    await fc.assert(
      fc.asyncProperty(fc.oneof({ weight: 1, arbitrary: malformedBody.map((body) => ({ body, perChange: false })) }, { weight: 3, arbitrary: fc.array(malformedChange(), { minLength: 1, maxLength: 3 }).map((changes) => ({ body: { changes: changes.map(withFreshId) } as Json, perChange: true })) }), async ({ body, perChange }) => {
        const answer = await t.admin.post('/api/sync/push', body);
        if (perChange) {
          expect(answer.statusCode).toBe(200);
          const results = (answer.json() as { results: ChangeResult[] }).results;
          expect(results.length).toBe((body as { changes: Json[] }).changes.length);
          for (const r of results) {
            expect(r.status).toBe('rejected');
            expect(r.reason?.length).toBeGreaterThan(0);
            expectFieldNamed(r.errors);
          }
          perChangeRefusals += 1;
        } else {
          expect(answer.statusCode).toBeGreaterThanOrEqual(400);
          expect(answer.statusCode).toBeLessThan(500);
          expectFieldNamed((answer.json() as { errors: FieldError[] }).errors);
          wholeBodyRefusals += 1;
        }
      }),
      { numRuns: 10_000 },
    );
    expect(wholeBodyRefusals + perChangeRefusals).toBe(10_000);
    // Nothing malformed was stored: the log still ends at the three set-up changes after the unit.
    expect(await t.store.lastSeq(t.unit.id)).toBe(4);
  }, 120_000);
});
