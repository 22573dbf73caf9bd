/**
 * Bring a Debian package the tests need onto a fresh machine: when its program is missing, install it with
 * apt-get (the tests run as root on the project's machines), refreshing the package lists only if the first try
 * fails. Anything that stops it is one clear line, never a skipped test.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export interface DebianNeed {
  /** the program whose presence means the package is installed, e.g. /usr/bin/chromium */
  program: string;
  packages: string[];
  /** what the tests need it for, for messages */
  purpose: string;
}

/** One line for a failure of set-up (vitest prints the message of an error thrown by a global set-up). */
export class SetupError extends Error {}

function aptGet(args: string[]): void {
  execFileSync('apt-get', ['-o', 'DPkg::Lock::Timeout=600', '-o', 'Acquire::Retries=3', ...args], {
    stdio: ['ignore', 'ignore', 'pipe'],
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
    timeout: 15 * 60_000,
  });
}

function lastLine(error: unknown): string {
  const stderr = (error as { stderr?: Buffer | string }).stderr;
  const text = stderr ? String(stderr) : error instanceof Error ? error.message : String(error);
  return text.trim().split('\n').filter(Boolean).at(-1) ?? 'unknown error';
}

/** Install `need.packages` unless `need.program` exists; `log` says what is happening. */
export function ensureDebianPackages(need: DebianNeed, log: (line: string) => void = (line) => process.stderr.write(`${line}\n`)): void {
  if (existsSync(need.program)) return;
  const install = `apt-get install ${need.packages.join(' ')}`;
  if (typeof process.getuid === 'function' && process.getuid() !== 0) {
    throw new SetupError(`${need.purpose} need ${need.program}, which is missing; install it with \`${install}\` (the test set-up can do it only as root)`);
  }
  log(`test set-up: ${need.program} is missing; installing Debian's ${need.packages.join(', ')} for ${need.purpose} (${install})`);
  try {
    aptGet(['install', '-y', '-qq', ...need.packages]);
  } catch {
    try {
      aptGet(['update', '-qq']);
      aptGet(['install', '-y', '-qq', ...need.packages]);
    } catch (error) {
      throw new SetupError(`${need.purpose} need ${need.program}; \`${install}\` failed: ${lastLine(error)}`);
    }
  }
  if (!existsSync(need.program)) throw new SetupError(`${need.purpose} need ${need.program}; \`${install}\` ran but did not provide it`);
}
