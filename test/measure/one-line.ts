/** The one stderr line of a command that refused bad input (exit code 2, no stack trace). */
import { expect } from 'vitest';
import type { CliResult } from './cli-fixture.js';

export async function refusalLine(pending: Promise<CliResult>): Promise<string> {
  const result = await pending;
  expect(result.status).toBe(2);
  const lines = result.stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).not.toMatch(/internal error|    at /);
  return lines[0]!;
}
