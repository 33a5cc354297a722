import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { authOf } from '../auth/access-guard.ts';
import { parseInput } from '../parse-input.ts';
import type { Store } from '../storage/store.ts';
import { applyPush } from '../sync/apply-push.ts';
import { changesOfPushBody } from '../sync/push-body.ts';

/** At most this many changes per pull; the tablet keeps pulling while hasMore is true. */
export const maxChangesPerPull = 500;

const pullQuerySchema = z.strictObject({
  after: z
    .string()
    .regex(/^\d{1,15}$/, 'after must be the cursor from the previous pull (a whole number, 0 for the first pull)')
    .default('0')
    .transform(Number),
  limit: z
    .string()
    .regex(/^\d{1,4}$/, `limit must be a whole number from 1 to ${maxChangesPerPull}`)
    .default('200')
    .transform(Number)
    .refine((n) => n >= 1 && n <= maxChangesPerPull, { message: `limit must be a whole number from 1 to ${maxChangesPerPull}`, params: { min: 1, max: maxChangesPerPull } }),
});

/** The sync contract: push the outbox (answered per change), pull the unit's changes after a cursor. */
export function registerSyncRoutes(app: FastifyInstance, { store, nowMs }: { store: Store; nowMs: () => number }): void {
  app.post('/api/sync/push', async (request) => {
    const { user, device } = authOf(request);
    const changes = changesOfPushBody(request.body);
    const results = await applyPush(store, { user, device }, changes, nowMs());
    return { results };
  });

  app.get('/api/sync/pull', async (request) => {
    const { user } = authOf(request);
    const { after, limit } = parseInput(pullQuerySchema, request.query);
    const rows = await store.pullChanges(user.unitId, after, limit + 1);
    const page = rows.slice(0, limit);
    const changes = page.map((c) => {
      const item: Record<string, unknown> = { seq: c.seq, changeId: c.changeId, kind: c.kind, record: c.record, serverTimeMs: c.serverTimeMs, deviceTimeMs: c.deviceTimeMs };
      if (c.derived) {
        item.derived = c.derived;
        item.coreVersion = c.coreVersion;
      }
      return item;
    });
    return { changes, cursor: String(page.at(-1)?.seq ?? after), hasMore: rows.length > limit };
  });
}
