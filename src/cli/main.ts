/**
 * The railpulse command line: commander wiring only. Parse arguments, call the library, print, set the
 * exit code. A user's mistake is one line on stderr and exit code 2, never a stack trace.
 */
import { Command, CommanderError } from 'commander';
import { InputError } from '../core/errors.js';
import { registerRun } from './run.js';
import { registerIndex } from './archive.js';
import { registerMeasureCommands } from './measure.js';
import { registerCompareCommand } from './compare.js';
import { registerSizeCommand } from './size.js';
import { registerSweepCommands } from './sweep.js';
import { TOOL_VERSION } from '../version.js';

async function main(argv: string[]): Promise<void> {
  const program = new Command();
  program
    .name('railpulse')
    .description('Shot simulator for electromagnetic rail accelerators: bank, rails, armature, energy ledger, shot records.')
    .version(TOOL_VERSION, '-v, --version')
    .showHelpAfterError()
    .exitOverride();
  registerRun(program);
  registerIndex(program);
  registerMeasureCommands(program);
  registerSweepCommands(program);
  registerCompareCommand(program);
  registerSizeCommand(program);
  try {
    // async: sweep and size await their workers; their errors must reach handle() like any other
    await program.parseAsync(argv);
  } catch (error) {
    handle(error);
  }
}

export function handle(error: unknown): never {
  if (error instanceof CommanderError) {
    process.exit(error.exitCode === 0 ? 0 : 2);
  }
  if (error instanceof InputError) {
    process.stderr.write(`railpulse: ${error.line()}\n`);
    process.exit(2);
  }
  const message = error instanceof Error ? error.message : String(error);
  process.stderr.write(`railpulse: internal error: ${message}\n`);
  if (process.env.RAILPULSE_DEBUG && error instanceof Error) process.stderr.write(`${error.stack}\n`);
  process.exit(1);
}

process.on('uncaughtException', handle);
process.on('unhandledRejection', handle);
await main(process.argv);
