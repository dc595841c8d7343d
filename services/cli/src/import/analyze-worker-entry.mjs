// An analyze worker's entry: worker threads do not inherit the tsx loader, so the worker registers it
// before loading its TypeScript (as the ingester's decode workers do).
import { register } from 'tsx/esm/api';

register();
await import('./analyze-worker.ts');
