import { describe, expect, it } from 'vitest';
import type { Route } from '../../src/app/routes.ts';
import { hrefOf, parseRoute } from '../../src/app/routes.ts';

describe('hash routes', () => {
  const routes: Route[] = [
    { screen: 'board' },
    { screen: 'bed', bedId: 'bed-01' },
    { screen: 'new-read', bedId: 'bed 7/a' },
    { screen: 'start-monitoring', bedId: 'bed-01' },
    { screen: 'amend', readId: '019cd6c2-8c00-72af-bbd8-eae803ce8abc' },
    { screen: 'settings' },
  ];
  it.each(routes)('reads back the hash it writes for %o', (route) => {
    expect(parseRoute(hrefOf(route))).toEqual(route);
  });
  it.each(['', '#', '#/', '#/nowhere', '#/beds/'])('opens the board for "%s"', (hash) => {
    expect(parseRoute(hash)).toEqual({ screen: 'board' });
  });
});
