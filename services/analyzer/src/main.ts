import type { Logger } from '@thermargin/shared/log';
import { readAnalyzerProcessConfig, startAnalyzerProcess } from './service.ts';

/** `node --import tsx services/analyzer/src/main.ts`: the analyzer as a process (configuration: README.md). */
const log: Logger = (event, detail) =>
  process.stderr.write(`${JSON.stringify({ time: new Date().toISOString(), event, ...detail })}\n`);

const running = await startAnalyzerProcess(readAnalyzerProcessConfig(), log);
if (running.health_port) log('health', { port: running.health_port });
let stopping = false;
const stop = (signal: string) => {
  if (stopping) return;
  stopping = true;
  log('shutdown', { signal });
  running.stop().then(
    () => process.exit(0),
    () => process.exit(1),
  );
};
process.once('SIGINT', () => stop('SIGINT'));
process.once('SIGTERM', () => stop('SIGTERM'));
