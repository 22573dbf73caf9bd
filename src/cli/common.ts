/** Small helpers shared by the command files. */

/** commander's collector for a repeatable option (give no default, so the help does not print "(default: [])"). */
export const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

/** A line for the person at the terminal (stderr, so stdout stays machine-readable). */
export function say(line: string): void {
  process.stderr.write(`${line}\n`);
}
