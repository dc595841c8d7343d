export * from './config.ts';
export * from './decode.ts';
export * from './ingester.ts';
export * from './metrics.ts';
export * from './pipeline.ts';
export * from './spool.ts';
