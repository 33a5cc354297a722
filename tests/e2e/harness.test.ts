import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Tablet, UnitServer } from './support/e2e-harness.ts';
import { chromiumAvailable, ensureAppBuilt, openTablet, startUnitServer } from './support/e2e-harness.ts';

const run = chromiumAvailable();

describe.runIf(run)('the browser harness', () => {
  let server: UnitServer;
  let tablet: Tablet;
  beforeAll(async () => {
    ensureAppBuilt();
    server = await startUnitServer({ admin: { username: 'admin', name: 'T. Admin', password: 'correct horse battery' } });
    tablet = await openTablet();
  });
  afterAll(async () => {
    await tablet?.close();
    await server?.stop();
  });

  it('serves the built app and the health answer from one real server process', async () => {
    const page = await tablet.context.newPage();
    await page.goto(server.url);
    await expect.poll(() => page.title()).toBe('Rhythm Ledger');
    const health = await page.evaluate(async () => (await fetch('/api/health')).json());
    expect(health).toMatchObject({ status: 'ok', storage: 'sqlite' });
  });
});
