import { REANALYZE_USAGE, reanalyzeCommand } from '@thermargin/analyzer/reanalyze-command';
import { InputError } from '@thermargin/shared';
import { ANALYZE_USAGE, analyzeCommand } from './commands/analyze.ts';
import { SIZING_USAGE, sizingCommand } from './commands/sizing.ts';

const COMMANDS: Record<
  string,
  { usage: string; run: (argv: string[], log: (l: string) => void) => Promise<void> }
> = {
  analyze: { usage: ANALYZE_USAGE, run: analyzeCommand },
  sizing: { usage: SIZING_USAGE, run: sizingCommand },
  reanalyze: { usage: REANALYZE_USAGE, run: reanalyzeCommand },
};

const USAGE = `thermargin — per-trip heat load, in-service radiator k and cooling margin from fleet telemetry

${Object.values(COMMANDS)
  .map((c) => c.usage)
  .join('\n\n')}`;

/** Runs one command; returns the process exit code (0 done, 2 unusable input or usage, 1 failure). */
export async function main(argv: string[]): Promise<number> {
  const log = (line: string) => process.stderr.write(`${line}\n`);
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(`${USAGE}\n`);
    return name ? 0 : 2;
  }
  const cmd = COMMANDS[name];
  if (!cmd) {
    log(`thermargin: unknown command "${name}"\n\n${USAGE}`);
    return 2;
  }
  try {
    await cmd.run(rest, log);
    return 0;
  } catch (e) {
    if (e instanceof InputError) {
      log(`thermargin ${name}: ${e.message}`);
      return 2;
    }
    if (e instanceof TypeError && (e as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      log(`thermargin ${name}: ${e.message}\n\nusage:\n${cmd.usage}`);
      return 2;
    }
    log(`thermargin ${name}: failed: ${(e as Error).stack ?? e}`);
    return 1;
  }
}
