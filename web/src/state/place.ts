import { useEffect, useState } from 'preact/hooks';

/** Screens by deep link: `#/fleet`, `#/vehicle/<id>`, `#/trip/<id>/<trip>`, `#/queue`, `#/work-order/<id>`, `#/refused`, `#/sizing`. */
export type Place =
  | { screen: 'fleet' }
  | { screen: 'vehicle'; id: string }
  | { screen: 'trip'; id: string; trip: string; points: number }
  | { screen: 'queue' }
  | { screen: 'work-order'; id: string }
  | { screen: 'refused' }
  | { screen: 'sizing' }
  | { screen: 'unknown'; hash: string };

/** points per signal asked of the API by default; `?points=` in the link overrides (10…20 000). */
export const TRACE_POINTS = 4000;

export function parsePlace(hash: string): Place {
  const [path = '', query = ''] = hash.replace(/^#/, '').split('?');
  const parts = path.split('/').filter(Boolean).map(decodeURIComponent);
  const [head, a, b] = parts;
  if (!head || head === 'fleet') return { screen: 'fleet' };
  if (head === 'vehicle' && a && parts.length === 2) return { screen: 'vehicle', id: a };
  if (head === 'trip' && a && b && parts.length === 3) {
    const asked = Number(new URLSearchParams(query).get('points'));
    const points = Number.isInteger(asked) && asked >= 10 ? Math.min(asked, 20_000) : TRACE_POINTS;
    return { screen: 'trip', id: a, trip: b, points };
  }
  if (head === 'queue' && !a) return { screen: 'queue' };
  if (head === 'work-order' && a) return { screen: 'work-order', id: a };
  // `#/intake`: the screen's old link, still followed.
  if ((head === 'refused' || head === 'intake') && !a) return { screen: 'refused' };
  if (head === 'sizing' && !a) return { screen: 'sizing' };
  return { screen: 'unknown', hash };
}

export const href = {
  fleet: () => '#/fleet',
  vehicle: (id: string) => `#/vehicle/${encodeURIComponent(id)}`,
  trip: (id: string, trip: string) => `#/trip/${encodeURIComponent(id)}/${encodeURIComponent(trip)}`,
  queue: () => '#/queue',
  workOrder: (id: string) => `#/work-order/${encodeURIComponent(id)}`,
  refused: () => '#/refused',
  sizing: () => '#/sizing',
};

export const go = (to: string): void => {
  location.hash = to;
};

export function usePlace(): Place {
  const [place, setPlace] = useState(() => parsePlace(location.hash));
  useEffect(() => {
    const on = () => setPlace(parsePlace(location.hash));
    addEventListener('hashchange', on);
    return () => removeEventListener('hashchange', on);
  }, []);
  return place;
}
