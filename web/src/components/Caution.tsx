import { safetyCaution } from '@thermargin/shared/safety';

/**
 * The safety caution for the vehicles' powertrains, beside every recommendation and on every work order
 * (the API's `safety_caution` when the screen has it, else the same text made here from the powertrains).
 */
export function Caution({ text, powertrains }: { text?: string; powertrains?: readonly string[] }) {
  const lines = (text ?? safetyCaution(powertrains)).split('\n');
  return (
    <aside class="caution" aria-label="Safety caution">
      <svg viewBox="0 0 16 16" width="18" height="18" aria-hidden="true" fill="currentColor">
        <path d="M8 1 L15 14 H1 Z M7.2 5.5 H8.8 V10 H7.2 Z M7.2 11 H8.8 V12.6 H7.2 Z" fill-rule="evenodd" />
      </svg>
      <div>
        {lines.map((l) => (
          <p key={l}>{l}</p>
        ))}
      </div>
    </aside>
  );
}

/** The design-side note beside sizing figures. */
export function DesignNote({ text }: { text: string }) {
  return (
    <aside class="design-note" aria-label="Design note">
      <p>{text}</p>
    </aside>
  );
}
