import { InputError, type Problem } from '@thermargin/shared';

/** Options a command cannot run with: the reason goes first, on one line, then the command's usage. */
export class UsageError extends InputError {
  constructor(problems: Problem[]) {
    super(problems, 'wrong options');
    this.message = problems.map((p) => `${p.where}: ${p.rule}`).join('; ');
    this.name = 'UsageError';
  }
}
