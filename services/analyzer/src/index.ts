export * from './analyzer.ts';
export * from './catch-up.ts';
export * from './config.ts';
export * from './options.ts';
