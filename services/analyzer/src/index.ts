export * from './analyzer.ts';
export * from './catch-up.ts';
export * from './commit.ts';
export * from './config.ts';
export * from './fleet-file.ts';
export * from './options.ts';
