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
