import { useState } from 'preact/hooks';
import { ApiFailure } from '../api/client.ts';
import { type Session, signIn } from '../state/session.ts';

/** Sign-in: an API token (from the operator); kept for this browser tab only. */
export function SignIn({ onSession, notice }: { onSession: (s: Session) => void; notice?: string }) {
  const [token, setToken] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const submit = async (e: Event) => {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      onSession(await signIn(token.trim()));
    } catch (err) {
      setError(
        err instanceof ApiFailure && err.status === 401
          ? 'This token is not valid. Check it with whoever runs the server.'
          : (err as Error).message,
      );
    } finally {
      setBusy(false);
    }
  };
  return (
    <main class="signin" id="main">
      <form onSubmit={submit} class="card signin-card" aria-labelledby="signin-title">
        <h1 id="signin-title">
          <span class="brand-mark" aria-hidden="true" /> thermargin
        </h1>
        <p class="muted">Cooling margin and radiator health for the fleet.</p>
        {notice && <p class="state state-empty">{notice}</p>}
        <label for="token">API token</label>
        <input
          id="token"
          type="password"
          autocomplete="off"
          required
          minLength={8}
          value={token}
          onInput={(e) => setToken((e.target as HTMLInputElement).value)}
        />
        <p class="hint">Kept in this tab only; closing the tab signs you out.</p>
        {error && (
          <p class="state state-error" role="alert">
            {error}
          </p>
        )}
        <button type="submit" class="btn btn-primary" disabled={busy || !token.trim()}>
          {busy ? 'Checking…' : 'Sign in'}
        </button>
      </form>
    </main>
  );
}
