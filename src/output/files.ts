/**
 * Writing generated files: atomically (temporary file, then a link that fails if the name exists) and never
 * over an existing file.
 */
import { linkSync, unlinkSync, writeFileSync, existsSync } from 'node:fs';
import { dirname, basename, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { InputError } from '../scenario/errors.js';

/** Write `content` to exactly `path`; refuse (InputError) if it exists. */
export function writeFileExclusive(path: string, content: string | Uint8Array, option = 'output'): void {
  if (existsSync(path)) throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
  const temporary = join(dirname(path), `.${basename(path)}.${randomBytes(6).toString('hex')}.tmp`);
  writeFileSync(temporary, content);
  try {
    linkSync(temporary, path);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') {
      throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
    }
    throw error;
  } finally {
    unlinkSync(temporary);
  }
}
