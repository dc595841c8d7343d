import type { ComponentChildren } from 'preact';
import { STATUS_WORD } from '../format.ts';
import { useLive } from '../state/live.ts';
import { href, type Place } from '../state/place.ts';
import type { Session } from '../state/session.ts';

const NAV = [
  { to: href.fleet(), label: 'Margin overview', screens: ['fleet', 'vehicle', 'trip'] },
  { to: href.queue(), label: 'Workshop queue', screens: ['queue', 'work-order'] },
  { to: href.refused(), label: 'Refused data', screens: ['refused'] },
  { to: href.sizing(), label: 'Sizing sheet', screens: ['sizing'] },
];

const LIVE_WORD = { connecting: 'connecting…', live: 'live', retrying: 'reconnecting…' };

/** Header with navigation, the live stream's state and the latest status changes; then the screen. */
export function Shell({
  session,
  place,
  onSignOut,
  children,
}: {
  session: Session;
  place: Place;
  onSignOut: () => void;
  children: ComponentChildren;
}) {
  const live = useLive();
  return (
    <>
      <button type="button" class="skip" onClick={() => document.getElementById('main')?.focus()}>
        Skip to content
      </button>
      <header class="top">
        <a class="brand" href={href.fleet()}>
          <span class="brand-mark" aria-hidden="true" /> thermargin
        </a>
        <nav aria-label="Screens">
          {NAV.map((n) => (
            <a key={n.to} href={n.to} aria-current={n.screens.includes(place.screen) ? 'page' : undefined}>
              {n.label}
            </a>
          ))}
        </nav>
        <div class="top-right">
          <span class={`live live-${live.state}`} data-live={live.state}>
            <span class="live-dot" aria-hidden="true" /> {LIVE_WORD[live.state]}
          </span>
          <span class="role" data-role={session.role} title={`signed in as ${session.name}`}>
            {session.role}
          </span>
          <button type="button" class="btn btn-quiet" onClick={onSignOut}>
            Sign out
          </button>
        </div>
      </header>
      <div class="changes" aria-live="polite">
        {live.changes.slice(0, 1).map((c) => (
          <p key={c.at_ms} class="change" data-change={c.vehicle}>
            Status change: <a href={href.vehicle(c.vehicle)}>{c.vehicle}</a>{' '}
            {STATUS_WORD[c.from ?? 'unassessed']} → {STATUS_WORD[c.to]}
          </p>
        ))}
      </div>
      <main id="main" tabIndex={-1}>
        {children}
      </main>
    </>
  );
}
