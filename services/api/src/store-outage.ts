import { type SampleStore, storeFault } from '@thermargin/store';
import { HttpError } from './http-error.ts';

/**
 * The sample store as the routes see it: a call that fails (InfluxDB down, SQLite file gone, disk
 * full) is answered 503 naming the store, what is wrong (faults.ts) and its own words, not 500
 * "internal error", so the dashboard can say what is wrong and a client knows to retry.
 */
export function outageAs503(store: SampleStore): SampleStore {
  const outage = (e: unknown) =>
    e instanceof HttpError
      ? e
      : Object.assign(
          new HttpError(503, 'store_unavailable', `sample store (${store.kind}): ${storeFault(e).reason}`),
          { cause: e },
        );
  return new Proxy(store, {
    get(target, name, receiver) {
      const v: unknown = Reflect.get(target, name, receiver);
      if (typeof v !== 'function') return v;
      return (...args: unknown[]) => {
        try {
          const r: unknown = v.apply(target, args);
          return r instanceof Promise ? r.catch((e) => Promise.reject(outage(e))) : r;
        } catch (e) {
          throw outage(e);
        }
      };
    },
  });
}
