// A stand-alone entry for the study commands (used by the tests and the benchmark), with the CLI's error contract:
// InputError → one line on stderr, exit 2.
import { Command } from 'commander';
import { InputError } from '../../src/scenario/errors.js';
import { registerStudyCommands } from '../../src/study/commands.js';

const program = new Command('railpulse').exitOverride();
registerStudyCommands(program);
try {
  await program.parseAsync(process.argv);
} catch (error) {
  if (error instanceof InputError) {
    process.stderr.write(`railpulse: ${error.line()}\n`);
    process.exit(2);
  }
  if (error && typeof error === 'object' && 'exitCode' in error) process.exit(Number((error as { exitCode: number }).exitCode));
  throw error;
}
