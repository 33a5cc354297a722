import { useEffect, useState } from 'preact/hooks';
import type { HandoverRoute } from './handover-routes.ts';
import { handoverHrefOf, parseHandoverRoute } from './handover-routes.ts';

/** The screens, addressed by hash so they open from the service worker's cached shell with no network. */
export type Route =
  | { screen: 'board' }
  | { screen: 'bed'; bedId: string }
  | { screen: 'new-read'; bedId: string }
  | { screen: 'start-monitoring'; bedId: string }
  | { screen: 'amend'; readId: string }
  | { screen: 'settings' }
  | { screen: 'refused' }
  | { screen: 'audit' }
  | HandoverRoute;

/** The route a location hash names; anything unknown opens the board. */
export function parseRoute(hash: string): Route {
  const handover = parseHandoverRoute(hash);
  if (handover) return handover;
  const parts = hash.replace(/^#\/?/, '').split('/').filter(Boolean).map(decodeURIComponent);
  const [first, id, action] = parts;
  if (first === 'beds' && id && action === 'read') return { screen: 'new-read', bedId: id };
  if (first === 'beds' && id && action === 'start') return { screen: 'start-monitoring', bedId: id };
  if (first === 'beds' && id) return { screen: 'bed', bedId: id };
  if (first === 'reads' && id && action === 'amend') return { screen: 'amend', readId: id };
  if (first === 'settings') return { screen: 'settings' };
  if (first === 'refused') return { screen: 'refused' };
  if (first === 'audit') return { screen: 'audit' };
  return { screen: 'board' };
}

/** The hash for a route. */
export function hrefOf(route: Route): string {
  switch (route.screen) {
    case 'board':
      return '#/beds';
    case 'bed':
      return `#/beds/${encodeURIComponent(route.bedId)}`;
    case 'new-read':
      return `#/beds/${encodeURIComponent(route.bedId)}/read`;
    case 'start-monitoring':
      return `#/beds/${encodeURIComponent(route.bedId)}/start`;
    case 'amend':
      return `#/reads/${encodeURIComponent(route.readId)}/amend`;
    case 'settings':
      return '#/settings';
    case 'refused':
      return '#/refused';
    case 'audit':
      return '#/audit';
    case 'handover':
    case 'handover-bed':
    case 'print':
      return handoverHrefOf(route);
  }
}

/** Opens a route. */
export function go(route: Route): void {
  location.hash = hrefOf(route);
}

/** The current route, following hash changes. */
export function useRoute(): Route {
  const [route, setRoute] = useState(() => parseRoute(location.hash));
  useEffect(() => {
    const onChange = () => {
      setRoute(parseRoute(location.hash));
      window.scrollTo?.(0, 0);
    };
    window.addEventListener('hashchange', onChange);
    // A hash change between the first render and this listener (a tap right after unlocking) would otherwise be lost.
    const now = parseRoute(location.hash);
    setRoute((shown) => (JSON.stringify(shown) === JSON.stringify(now) ? shown : now));
    return () => window.removeEventListener('hashchange', onChange);
  }, []);
  return route;
}
