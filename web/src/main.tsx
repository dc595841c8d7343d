import '@thermargin/shared/zod-jitless';
import { render } from 'preact';
import { App } from './App.tsx';
import { Loading } from './components/States.tsx';
import { forgetToken, type Session, savedToken, signIn } from './state/session.ts';
import './styles.css';

/** Resumes a session kept in this tab (the token is checked again), else shows the sign-in. */
async function boot(): Promise<void> {
  const root = document.getElementById('app')!;
  const token = savedToken();
  let session: Session | null = null;
  if (token) {
    render(<Loading what="your session" />, root);
    session = await signIn(token).catch(() => {
      forgetToken();
      return null;
    });
  }
  render(<App initial={session} />, root);
}

void boot();
