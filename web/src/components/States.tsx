import type { ComponentChildren } from 'preact';
import type { Resource } from '../state/resource.ts';

export function Loading({ what }: { what: string }) {
  return (
    <div class="state state-loading" role="status" aria-live="polite">
      <span class="spinner" aria-hidden="true" /> Loading {what}…
    </div>
  );
}

export function Empty({ children }: { children: ComponentChildren }) {
  return <div class="state state-empty">{children}</div>;
}

export function ErrorBox({ error, retry }: { error: Error; retry?: () => void }) {
  return (
    <div class="state state-error" role="alert">
      <strong>Could not load:</strong> {error.message}
      {retry && (
        <button type="button" class="btn" onClick={retry}>
          Try again
        </button>
      )}
    </div>
  );
}

/** Loading, error or the content; an error during a refresh keeps the previous data under a notice. */
export function Loaded<T>({
  res,
  what,
  children,
}: {
  res: Resource<T> & { reload(): void };
  what: string;
  children: (data: T) => ComponentChildren;
}) {
  if (res.state === 'loading') return <Loading what={what} />;
  if (res.state === 'error' && res.data === undefined)
    return <ErrorBox error={res.error} retry={res.reload} />;
  return (
    <>
      {res.state === 'error' && <ErrorBox error={res.error} retry={res.reload} />}
      {children(res.data as T)}
    </>
  );
}
