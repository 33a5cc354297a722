/** Paper sizes the print layout is made for. */
export type PaperSize = 'a4' | 'letter';

/**
 * The handover screens: the desk (`#/handover?shift=KEY`), one bed's handover
 * (`#/handover/<bedId>?shift=KEY`) and the printouts (`#/print/unit?shift=KEY&paper=a4`,
 * `#/print/bed/<bedId>?shift=KEY&paper=letter`). Without a shift they show the one under way.
 */
export type HandoverRoute =
  | { screen: 'handover'; shiftKey: string | null }
  | { screen: 'handover-bed'; bedId: string; shiftKey: string | null }
  | { screen: 'print'; bedId: string | null; shiftKey: string | null; paper: PaperSize };

/** The handover route a hash names, or null when it names another screen. */
export function parseHandoverRoute(hash: string): HandoverRoute | null {
  const [path = '', query = ''] = hash.replace(/^#\/?/, '').split('?');
  const [first, second, third] = path.split('/').filter(Boolean).map(decodeURIComponent);
  const params = new URLSearchParams(query);
  const shiftKey = params.get('shift') || null;
  if (first === 'handover') return second ? { screen: 'handover-bed', bedId: second, shiftKey } : { screen: 'handover', shiftKey };
  if (first !== 'print') return null;
  const paper: PaperSize = params.get('paper') === 'letter' ? 'letter' : 'a4';
  if (second === 'bed' && third) return { screen: 'print', bedId: third, shiftKey, paper };
  if (second === 'unit') return { screen: 'print', bedId: null, shiftKey, paper };
  return null;
}

/** The hash for a handover route. */
export function handoverHrefOf(route: HandoverRoute): string {
  const params = new URLSearchParams();
  if (route.shiftKey) params.set('shift', route.shiftKey);
  if (route.screen === 'print' && route.paper !== 'a4') params.set('paper', route.paper);
  const query = params.toString() === '' ? '' : `?${params.toString()}`;
  switch (route.screen) {
    case 'handover':
      return `#/handover${query}`;
    case 'handover-bed':
      return `#/handover/${encodeURIComponent(route.bedId)}${query}`;
    case 'print':
      return `${route.bedId === null ? '#/print/unit' : `#/print/bed/${encodeURIComponent(route.bedId)}`}${query}`;
  }
}
