import type { LightMyRequestResponse } from 'fastify';
import type { ReadAnalysis } from '../../src/core/analyze-read.ts';
import type { Change } from '../../src/core/records.ts';
import type { ChangeResult } from '../../src/server/sync/change-result.ts';
import type { Clinician } from './test-app.ts';

export interface PulledItem {
  seq: number;
  changeId: string;
  kind: string;
  record: Record<string, unknown> & { id: string };
  serverTimeMs: number;
  deviceTimeMs: number;
  derived?: ReadAnalysis;
  coreVersion?: string;
}

/** Pushes changes and returns the per-change results (throws unless the push as a whole answered 200). */
export async function push(who: Clinician, changes: unknown[]): Promise<ChangeResult[]> {
  const answer: LightMyRequestResponse = await who.post('/api/sync/push', { changes });
  if (answer.statusCode !== 200) throw new Error(`push answered ${answer.statusCode}: ${answer.body}`);
  return (answer.json() as { results: ChangeResult[] }).results;
}

/** Pulls every change after the cursor, page by page, as a tablet does. */
export async function pullAll(who: Clinician, after = '0', limit = 500): Promise<{ changes: PulledItem[]; cursor: string }> {
  const changes: PulledItem[] = [];
  let cursor = after;
  for (;;) {
    const answer = await who.get(`/api/sync/pull?after=${cursor}&limit=${limit}`);
    if (answer.statusCode !== 200) throw new Error(`pull answered ${answer.statusCode}: ${answer.body}`);
    const page = answer.json() as { changes: PulledItem[]; cursor: string; hasMore: boolean };
    changes.push(...page.changes);
    cursor = page.cursor;
    if (!page.hasMore) return { changes, cursor };
  }
}

export const statusesOf = (results: ChangeResult[]) => results.map((r) => r.status);
export const idsOf = (changes: Change[]) => changes.map((c) => c.changeId);
