/**
 * The one error type for input a user can fix. It carries where the problem is (a scenario path such as
 * `bank[1].capacitance`, a file and line, or a command-line option) and what was expected; the CLI turns it
 * into one line and exit code 2, never a stack trace.
 */
export class InputError extends Error {
  constructor(
    /** where: a scenario path, "file:line", or an option name */
    readonly where: string,
    /** what was expected and what was found */
    readonly problem: string,
    /** the file the problem is in, when there is one */
    readonly file?: string,
  ) {
    super(where ? `${where}: ${problem}` : problem);
    this.name = 'InputError';
  }

  /** The single line the CLI prints. */
  line(): string {
    const prefix = this.file ? `${this.file}: ` : '';
    return `${prefix}${this.message}`;
  }
}

/**
 * Exit codes of every command (documented in the README):
 * 0 the command did its work (a shot of any outcome, a feasible design, a matching re-run);
 * 1 an internal error (a defect of railpulse: please report it);
 * 2 input the user can fix (one line on stderr);
 * 3 the command completed and its answer is "no": no feasible design (`size`), or a re-run whose results differ
 *   from its record (`run --from-report`).
 */
export const EXIT = { ok: 0, internal: 1, input: 2, negative: 3 } as const;

/** What a file-system error code means to a person, for the codes a user can do something about. */
const FILE_PROBLEMS: Readonly<Record<string, string>> = {
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'the file system is read-only',
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  ENOENT: 'no such file or folder',
  ENOTDIR: 'a part of the path is not a folder',
  EISDIR: 'is a folder, not a file',
  EEXIST: 'exists already; railpulse never overwrites a file',
  ENAMETOOLONG: 'the name is too long',
  ELOOP: 'too many symbolic links',
  EMFILE: 'too many open files',
  ENFILE: 'too many open files on the system',
  EFBIG: 'the file is too large for the file system',
  EIO: 'input/output error on the device',
  ENOTEMPTY: 'the folder is not empty',
  EBUSY: 'the file or folder is busy',
  ETXTBSY: 'the file is busy',
  EXDEV: 'cannot link across file systems',
};

/** The error code of a Node system error, if it is one. */
export function errorCode(error: unknown): string | undefined {
  const code = (error as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : undefined;
}

/**
 * A file-system failure the user can fix (a read-only or full disk, a missing folder, no permission) as an
 * InputError naming `path`: the file or folder the user knows, never a temporary file of ours. Returns undefined
 * for any other error, which stays an internal error.
 */
export function fileProblem(error: unknown, path: string, what = ''): InputError | undefined {
  if (error instanceof InputError) return error;
  const code = errorCode(error);
  if (code === undefined || !Object.hasOwn(FILE_PROBLEMS, code)) return undefined;
  const problem = FILE_PROBLEMS[code]!;
  return new InputError(path, `${what ? `${what}: ` : ''}${problem} (${code})`);
}

/** Run `work`, turning a file-system failure a user can fix into an InputError naming `path`. */
export function withFileProblems<T>(path: string, work: () => T, what = ''): T {
  try {
    return work();
  } catch (error) {
    throw fileProblem(error, path, what) ?? error;
  }
}

/** How the command line reports an error: its exit code and the one line on stderr. */
export interface ErrorReport {
  code: (typeof EXIT)['input'] | (typeof EXIT)['internal'];
  line: string;
}

/**
 * The one classification of errors every command shares (the CLI's handler and the fuzz test use it): input a
 * user can fix, including a file-system problem that names its path, is exit 2; anything else is an internal
 * error, exit 1.
 */
export function classifyError(error: unknown): ErrorReport {
  const path = (error as { path?: unknown } | null)?.path;
  const input = error instanceof InputError ? error : typeof path === 'string' ? fileProblem(error, path) : undefined;
  if (input) return { code: EXIT.input, line: input.line() };
  const message = error instanceof Error ? error.message : String(error);
  return { code: EXIT.internal, line: `internal error: ${message}` };
}
