import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bodyLimitBytes } from '../../src/server/build-app.ts';
import type { TestApp } from './test-app.ts';
import { openTestApp } from './test-app.ts';

describe('the server at its edges: headers, caching, bodies', () => {
  let t: TestApp;
  let distDir: string;
  beforeAll(async () => {
    distDir = mkdtempSync(join(tmpdir(), 'rl-dist-'));
    mkdirSync(join(distDir, 'assets'));
    writeFileSync(join(distDir, 'index.html'), '<!doctype html><title>Rhythm Ledger</title><script type="module" src="/assets/app-3f9a1c.js"></script>');
    writeFileSync(join(distDir, 'assets', 'app-3f9a1c.js'), 'console.log(1)');
    writeFileSync(join(distDir, 'sw.js'), 'self.addEventListener("install", () => {})');
    t = await openTestApp({ settings: { distDir } });
  });
  afterAll(async () => {
    await t.close();
    rmSync(distDir, { recursive: true, force: true });
  });

  it('answers health without a session, with the storage kind and versions', async () => {
    const answer = await t.app.inject({ method: 'GET', url: '/api/health' });
    expect(answer.statusCode).toBe(200);
    expect(answer.json()).toEqual({ status: 'ok', storage: 'sqlite', coreVersion: '1.0.0', serverVersion: '0.1.0' });
  });

  it('sends a strict content-security policy and the other security headers on every answer', async () => {
    for (const url of ['/api/health', '/', '/assets/app-3f9a1c.js', '/api/me']) {
      const answer = await t.app.inject({ method: 'GET', url });
      const csp = answer.headers['content-security-policy'] as string;
      expect(csp).toContain("default-src 'self'");
      expect(csp).toContain("script-src 'self'");
      expect(csp).not.toContain('unsafe-inline');
      expect(csp).toContain("img-src 'self' data:");
      expect(csp).toContain("frame-ancestors 'none'");
      expect([answer.headers['x-content-type-options'], answer.headers['x-frame-options'], answer.headers['referrer-policy']]).toEqual(['nosniff', 'DENY', 'no-referrer']);
    }
  });

  it('never lets an API answer be cached', async () => {
    expect((await t.admin.get('/api/sync/pull')).headers['cache-control']).toBe('no-store');
  });

  it('caches hashed assets for a year, and revalidates index.html and the service worker every time', async () => {
    const asset = await t.app.inject({ method: 'GET', url: '/assets/app-3f9a1c.js' });
    expect([asset.statusCode, asset.headers['cache-control']]).toEqual([200, 'public, max-age=31536000, immutable']);
    const worker = await t.app.inject({ method: 'GET', url: '/sw.js' });
    expect([worker.statusCode, worker.headers['cache-control']]).toEqual([200, 'no-cache']);
    const index = await t.app.inject({ method: 'GET', url: '/' });
    expect([index.statusCode, index.headers['cache-control']]).toEqual([200, 'no-cache']);
  });

  it('serves index.html for the app’s own pages on reload, but a 404 for a missing file', async () => {
    const page = await t.app.inject({ method: 'GET', url: '/beds/4/reads', headers: { accept: 'text/html' } });
    expect([page.statusCode, page.headers['cache-control']]).toEqual([200, 'no-cache']);
    expect(page.body).toContain('<title>Rhythm Ledger</title>');
    expect((await t.app.inject({ method: 'GET', url: '/assets/missing-000000.js' })).statusCode).toBe(404);
  });

  it('refuses a body over 1 MB with 413 naming the body', async () => {
    const answer = await t.admin.post('/api/sync/push', { changes: [], padding: 'x'.repeat(bodyLimitBytes) });
    expect(answer.statusCode).toBe(413);
    expect((answer.json() as { errors: Array<{ field: string }> }).errors[0]?.field).toBe('body');
  });

  it('refuses broken JSON with 400 and a body that is not JSON with 415, both field-named', async () => {
    const headers = { authorization: `Bearer ${t.admin.token}`, 'x-device-token': t.deviceToken };
    const broken = await t.app.inject({ method: 'POST', url: '/api/sync/push', headers: { ...headers, 'content-type': 'application/json' }, payload: '{"changes": [' });
    expect([broken.statusCode, (broken.json() as { errors: Array<{ field: string; message: string }> }).errors[0]]).toEqual([400, { field: 'body', message: 'body: the request body is not valid JSON' }]);
    const text = await t.app.inject({ method: 'POST', url: '/api/sync/push', headers: { ...headers, 'content-type': 'text/plain' }, payload: 'changes' });
    expect([text.statusCode, (text.json() as { errors: Array<{ field: string }> }).errors[0]?.field]).toEqual([415, 'body']);
  });

  it('refuses a body that tries to set __proto__', async () => {
    const headers = { authorization: `Bearer ${t.admin.token}`, 'x-device-token': t.deviceToken, 'content-type': 'application/json' };
    const answer = await t.app.inject({ method: 'POST', url: '/api/sync/push', headers, payload: '{"changes": [], "__proto__": {"admin": true}}' });
    expect(answer.statusCode).toBe(400);
  });
});
