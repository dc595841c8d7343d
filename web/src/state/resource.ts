import { useCallback, useEffect, useRef, useState } from 'preact/hooks';

export type Resource<T> =
  | { state: 'loading'; data: undefined; error: undefined }
  | { state: 'ready'; data: T; error: undefined }
  | { state: 'error'; data: T | undefined; error: Error };

/**
 * Loads `load()` whenever `deps` change and on `reload()`. A refresh keeps showing the previous data
 * (no flash of the loading state on live updates); an answer that arrives after a newer request is dropped.
 */
export function useResource<T>(load: () => Promise<T>, deps: unknown[]): Resource<T> & { reload(): void } {
  const [res, setRes] = useState<Resource<T>>({ state: 'loading', data: undefined, error: undefined });
  const seq = useRef(0);
  const [tick, setTick] = useState(0);
  // The caller's deps decide when to load (`load` is a fresh closure on every render).
  useEffect(() => {
    const mine = ++seq.current;
    load().then(
      (data) => mine === seq.current && setRes({ state: 'ready', data, error: undefined }),
      (error: Error) => mine === seq.current && setRes((r) => ({ state: 'error', data: r.data, error })),
    );
  }, [...deps, tick]);
  const reload = useCallback(() => setTick((t) => t + 1), []);
  return { ...res, reload };
}
