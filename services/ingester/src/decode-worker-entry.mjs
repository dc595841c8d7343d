// The decode worker's entry: worker threads do not inherit the tsx loader (and ignore `--import` in
// their execArgv under some runners), so the worker registers it before loading its TypeScript.
import { register } from 'tsx/esm/api';

register();
await import('./decode-worker.ts');
