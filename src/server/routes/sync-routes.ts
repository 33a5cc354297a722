import type { FastifyInstance } from 'fastify';
import { z } from 'zod';
import { authOf } from '../auth/access-guard.ts';
import { HttpError } from '../http-error.ts';
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

  app.get('/api/sync/pull', async (request, reply) => {
    const { user } = authOf(request);
    const { after, limit } = parseInput(pullQuerySchema, request.query);
    // A cursor beyond the unit's last change means the database went back (restored from a backup):
    // the tablet must pull from 0 and push its records again, or it would miss changes numbered anew.
    if (after > 0 && after > (await store.lastSeq(user.unitId))) {
      throw new HttpError(409, { error: 'The unit server was restored from an earlier backup: pull again from the start and push every local record again.', code: 'cursor-ahead' });
    }
    const rows = await store.pullChangesText(user.unitId, after, limit + 1);
    const page = rows.slice(0, limit);
    // Records and analyses go out as the JSON text they were stored as, spliced in without a parse and re-serialise.
    const items = page.map((c) => {
      const head = `{"seq":${c.seq},"changeId":${JSON.stringify(c.changeId)},"kind":${JSON.stringify(c.kind)},"record":${c.recordJson},"serverTimeMs":${c.serverTimeMs},"deviceTimeMs":${c.deviceTimeMs}`;
      return c.derivedJson === null ? `${head}}` : `${head},"derived":${c.derivedJson},"coreVersion":${JSON.stringify(c.coreVersion)}}`;
    });
    const tail = `"cursor":${JSON.stringify(String(page.at(-1)?.seq ?? after))},"hasMore":${rows.length > limit}`;
    return reply.type('application/json; charset=utf-8').send(`{"changes":[${items.join(',')}],${tail}}`);
  });
}
