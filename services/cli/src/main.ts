import { InputError } from '@thermargin/shared';
import { UsageError } from './usage-error.ts';

interface Command {
  usage: string;
  run: (argv: string[], log: (l: string) => void) => Promise<void>;
}

/** Each command's module loads only when needed: start-up counts in every run, and reanalyze pulls in the stores. */
const COMMANDS: Record<string, () => Promise<Command>> = {
  analyze: async () => {
    const m = await import('./commands/analyze.ts');
    return { usage: m.ANALYZE_USAGE, run: m.analyzeCommand };
  },
  sizing: async () => {
    const m = await import('./commands/sizing.ts');
    return { usage: m.SIZING_USAGE, run: m.sizingCommand };
  },
  'draft-map': async () => {
    const m = await import('./commands/draft-map.ts');
    return { usage: m.DRAFT_MAP_USAGE, run: m.draftMapCommand };
  },
  reanalyze: async () => {
    const m = await import('./commands/reanalyze.ts');
    return { usage: m.REANALYZE_USAGE, run: m.reanalyzeCommand };
  },
};

async function usage(): Promise<string> {
  const commands = await Promise.all(Object.values(COMMANDS).map((load) => load()));
  return `thermargin — per-trip heat load, in-service radiator k and cooling margin from fleet telemetry

${commands.map((c) => c.usage).join('\n\n')}`;
}

/**
 * Runs one command; returns the process exit code (0 done, 2 unusable input or usage, 1 failure).
 * `thermargin COMMAND --help` prints that command's usage and exits 0.
 */
export async function main(argv: string[]): Promise<number> {
  const log = (line: string) => process.stderr.write(`${line}\n`);
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(`${await usage()}\n`);
    return name ? 0 : 2;
  }
  const load = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!load) {
    log(`thermargin: unknown command "${name}"\n\n${await usage()}`);
    return 2;
  }
  const cmd = await load();
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(`${cmd.usage}\n`);
    return 0;
  }
  try {
    await cmd.run(rest, log);
    return 0;
  } catch (e) {
    if (e instanceof UsageError) {
      log(`thermargin ${name}: ${e.message}\n\nusage:\n${cmd.usage}`);
      return 2;
    }
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
