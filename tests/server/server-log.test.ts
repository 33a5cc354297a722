import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createServerLog } from '../../src/server/server-log.ts';
import type { Store } from '../../src/server/storage/store.ts';
import { changeOf, demoBed, demoRead, demoStay } from './fixtures.ts';
import { push } from './sync-helpers.ts';
import type { TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

describe('server log', () => {
  let t: TestApp;
  const lines: string[] = [];
  beforeEach(async () => {
    lines.length = 0;
    t = await openTestApp({ log: createServerLog('debug', (line) => lines.push(line)) });
  });
  afterEach(async () => {
    await t.close();
  });

  it('prints method, route pattern, status and duration, and no patient data even at debug level', async () => {
    const bed = demoBed(t.unit.id);
    const stay = demoStay(t.unit.id, bed.id, { alias: 'X.Y.', recordNumber: 'MRN-554433', notes: 'allergic to penicillin' });
    await push(t.admin, [changeOf('bed.put', bed), changeOf('stay.put', stay), changeOf('read.sign', demoRead(stay, t.admin.user.id, { notes: 'chest pain at 06:00' }))]);
    await t.admin.get(`/api/sync/pull?after=0`);
    await t.admin.post(`/api/users/${t.admin.user.id}/end-sessions`);
    const all = lines.join('\n');
    expect(lines.some((l) => / info POST \/api\/sync\/push 200 \d+\.\d ms$/.test(l))).toBe(true);
    expect(lines.some((l) => / info POST \/api\/users\/:id\/end-sessions 200 /.test(l))).toBe(true);
    expect(all).not.toMatch(/X\.Y\.|MRN-554433|penicillin|chest pain|after=0/);
    expect(all).not.toContain(t.admin.user.id);
  });

  it('answers a storage fault with a 500 that quotes nothing, and logs only the error’s name', async () => {
    const failing = t.store as Store & { pullChangesText: Store['pullChangesText'] };
    failing.pullChangesText = async () => {
      throw new Error('relation "change_log" row for patient X.Y. is corrupt');
    };
    const answer = await t.admin.get('/api/sync/pull');
    expect(answer.statusCode).toBe(500);
    expect(answer.body).not.toContain('X.Y.');
    expect(lines.join('\n')).toContain('error GET /api/sync/pull failed: Error');
    expect(lines.join('\n')).not.toContain('X.Y.');
  });

  it('prints nothing at silent', () => {
    const quiet: string[] = [];
    const log = createServerLog('silent', (l) => quiet.push(l));
    log.error('x');
    log.info('y');
    expect(quiet).toEqual([]);
  });
});
