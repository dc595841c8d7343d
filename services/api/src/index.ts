export * from './app.ts';
export * from './config.ts';
export * from './deps.ts';
export * from './fleet-source.ts';
export * from './start.ts';
export * from './tokens.ts';
export * from './wiring.ts';
