/**
 * The railpulse command line: commander wiring only. Parse arguments, call the library, print, set the
 * exit code. A user's mistake is one line on stderr and exit code 2, never a stack trace.
 */
import { Command, CommanderError } from 'commander';
import { EXIT, classifyError, errorCode } from '../core/errors.js';
import { registerRun } from './run.js';
import { registerIndex } from './archive.js';
import { registerMeasureCommands } from './measure.js';
import { registerCompareCommand } from './compare.js';
import { registerSizeCommand } from './size.js';
import { registerDesignCommand } from './design.js';
import { registerSweepCommands } from './sweep.js';
import { TOOL_VERSION } from '../version.js';

/** The command whose arguments commander refused last, for the "see … --help" hint. */
let refusedBy = 'railpulse';

async function main(argv: string[]): Promise<void> {
  const program = new Command();
  program
    .name('railpulse')
    .description('Shot simulator for electromagnetic rail accelerators: bank, rails, armature, energy ledger, shot records.')
    .version(TOOL_VERSION, '-v, --version')
    .exitOverride();
  registerRun(program);
  registerIndex(program);
  registerMeasureCommands(program);
  registerSweepCommands(program);
  registerCompareCommand(program);
  registerSizeCommand(program);
  registerDesignCommand(program);
  // commander's own error output is replaced by handle()'s one line; its help and version still print.
  for (const command of [program, ...program.commands]) {
    const name = command === program ? 'railpulse' : `railpulse ${command.name()}`;
    command.configureOutput({
      outputError: () => {
        refusedBy = name;
      },
    });
  }
  try {
    // async: sweep and size await their workers; their errors must reach handle() like any other
    await program.parseAsync(argv);
  } catch (error) {
    handle(error);
  }
}

/** commander's message ("error: unknown option '--jsn'\n(Did you mean --json?)") as one line with a hint. */
export function commanderLine(message: string, command: string): string {
  const text = message
    .replace(/^error:\s*/i, '')
    .split('\n')
    .map((part) => part.trim())
    .filter(Boolean)
    .join(' ')
    .replace(/\(Did you mean (.*)\?\)/, '(did you mean $1?)');
  return `${text.replace(/\.$/, "")}; see "${command} --help"`;
}

export function handle(error: unknown): never {
  if (error instanceof CommanderError) {
    if (error.exitCode === 0) process.exit(EXIT.ok);
    if (error.code !== 'commander.help' && error.code !== 'commander.helpDisplayed') {
      process.stderr.write(`railpulse: ${commanderLine(error.message, refusedBy)}\n`);
    }
    process.exit(EXIT.input);
  }
  const report = classifyError(error);
  process.stderr.write(`railpulse: ${report.line}\n`);
  if (report.code === EXIT.internal && process.env.RAILPULSE_DEBUG && error instanceof Error) process.stderr.write(`${error.stack}\n`);
  process.exit(report.code);
}

/**
 * A reader that stops reading (`railpulse run … | head -1`) closes our stdout: that is the reader's choice, not a
 * failure, so the command ends quietly with the exit code it had. The work (records, studies) is already written
 * by the time anything is printed.
 */
function endQuietlyOnClosedPipe(stream: NodeJS.WriteStream): void {
  stream.on('error', (error) => {
    if (errorCode(error) === 'EPIPE') process.exit(typeof process.exitCode === 'number' ? process.exitCode : EXIT.ok);
    handle(error);
  });
}

endQuietlyOnClosedPipe(process.stdout);
endQuietlyOnClosedPipe(process.stderr);
process.on('uncaughtException', handle);
process.on('unhandledRejection', handle);
// not awaited at the top level: the CLI is bundled as CommonJS (scripts/build.mjs); main() reports its own errors
void main(process.argv);
