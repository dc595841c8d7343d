import { SAFETY_CAUTION } from '@thermargin/shared/safety';

/** The one safety caution, beside every recommendation and on every work order. */
export function Caution() {
  return (
    <aside class="caution" aria-label="Safety caution">
      <svg viewBox="0 0 16 16" width="18" height="18" aria-hidden="true" fill="currentColor">
        <path d="M8 1 L15 14 H1 Z M7.2 5.5 H8.8 V10 H7.2 Z M7.2 11 H8.8 V12.6 H7.2 Z" fill-rule="evenodd" />
      </svg>
      <p>{SAFETY_CAUTION.replace(/\n/g, ' ')}</p>
    </aside>
  );
}
