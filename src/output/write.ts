/**
 * Writing generated files: atomically (a reader never sees half a report) and never over an existing
 * file. The content goes to a temporary file in the target directory, which is then hard-linked to the
 * final name; link() fails with EEXIST instead of replacing, so a collision picks the next free name.
 */
import { randomBytes } from 'node:crypto';
import { accessSync, closeSync, readFileSync, constants, existsSync, fsyncSync, linkSync, openSync, renameSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { InputError, errorCode, fileProblem } from '../core/errors.js';

const MAX_SUFFIX = 10_000;

/**
 * Write `content` to a new temporary file in `dir`. A failure the user can fix (a read-only or full disk, no
 * permission) names `target`, the file the user asked for: the temporary name is ours and means nothing to them.
 */
function writeTemporary(dir: string, baseName: string, content: string | Uint8Array, target: string): string {
  // A random temporary name avoids colliding with a concurrent writer; it never reaches the final name.
  const temp = join(dir, `.${baseName}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`);
  let fd: number;
  try {
    fd = openSync(temp, 'wx', 0o644);
  } catch (error) {
    throw fileProblem(error, target, 'cannot write') ?? error;
  }
  try {
    writeSync(fd, typeof content === 'string' ? Buffer.from(content, 'utf8') : content);
    fsyncSync(fd);
  } catch (error) {
    closeSync(fd);
    removeQuietly(temp);
    throw fileProblem(error, target, 'cannot write') ?? error;
  }
  closeSync(fd);
  return temp;
}

function removeQuietly(path: string): void {
  try {
    unlinkSync(path);
  } catch {
    // already gone, or the folder went read-only meanwhile: nothing more can be done about a temporary file
  }
}

/** The nearest folder of `path` that exists (the one a recursive mkdir would create the rest in). */
function nearestExisting(path: string): string {
  let dir = resolve(path);
  while (!existsSync(dir)) {
    const parent = dirname(dir);
    if (parent === dir) break;
    dir = parent;
  }
  return dir;
}

/** Refuse (InputError naming `option` and `dir`) a folder that is a file or cannot be written or created. */
export function checkWritableFolder(dir: string, option: string): void {
  if (existsSync(dir) && !statSync(dir).isDirectory()) {
    throw new InputError(option, `${dir} is a file; give a folder or a new file name ending in .html`);
  }
  const existing = nearestExisting(dir);
  if (!statSync(existing).isDirectory()) throw new InputError(option, `${existing} is a file, so ${dir} cannot be a folder`);
  try {
    accessSync(existing, constants.W_OK);
  } catch (error) {
    const problem = fileProblem(error, dir, 'cannot write in this folder');
    throw problem ? new InputError(option, problem.message) : error;
  }
}

/**
 * Refuse, before any work is done, an output file whose name the user chose when it exists already or its folder
 * is missing or not writable: a long computation must not end in "cannot write".
 */
export function checkNewFile(path: string, option: string): void {
  const folder = dirname(path) || '.';
  if (!existsSync(folder) || !statSync(folder).isDirectory()) throw new InputError(option, `the folder of ${path} does not exist`);
  if (existsSync(path)) throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
  try {
    accessSync(folder, constants.W_OK);
  } catch (error) {
    const problem = fileProblem(error, path, 'cannot write in its folder');
    throw problem ? new InputError(option, problem.message) : error;
  }
}

/**
 * Write `content` to `dir/baseName.ext`, or `dir/baseName-2.ext`, `-3` … if taken. Returns the path
 * written. Never replaces an existing file.
 */
export function writeNewFile(dir: string, baseName: string, ext: string, content: string | Uint8Array): string {
  const extension = ext === '' || ext.startsWith('.') ? ext : `.${ext}`;
  const first = join(dir, `${baseName}${extension}`);
  const temp = writeTemporary(dir, baseName, content, first);
  try {
    for (let n = 1; n <= MAX_SUFFIX; n++) {
      const candidate = join(dir, `${baseName}${n === 1 ? '' : `-${n}`}${extension}`);
      try {
        linkSync(temp, candidate);
        return candidate;
      } catch (error) {
        if (errorCode(error) !== 'EEXIST') throw fileProblem(error, candidate, 'cannot write') ?? error;
      }
    }
    throw new InputError(dir, `no free file name for ${baseName}${extension} after ${MAX_SUFFIX} tries; clear the folder or choose another`);
  } finally {
    removeQuietly(temp);
  }
}

/** Lowercase ASCII words joined by dashes, e.g. "Bench shot #3 (Ø 12 mm)" → "bench-shot-3-o-12-mm". */
export function slug(text: string, maxLength = 60): string {
  const ascii = text.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').replace(/\u00D8|\u00F8/g, 'o').replace(/\u00DF/g, 'ss');
  const dashed = ascii
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  const cut = dashed.slice(0, maxLength).replace(/-+$/g, '');
  return cut || 'shot';
}

/** The UTC calendar date of an ISO date string or Date, as YYYY-MM-DD. */
function isoDay(date: string | Date): string {
  const parsed = typeof date === 'string' ? new Date(date) : date;
  if (Number.isNaN(parsed.getTime())) throw new RangeError(`not a date: ${String(date)}`);
  return parsed.toISOString().slice(0, 10);
}

/** e.g. reportBaseName('2026-12-02T10:00:00Z', 'Bench shot', '1a2b3c4d…') → "2026-12-02_bench-shot_1a2b3c4d". */
export function reportBaseName(date: string | Date, scenarioName: string, shortHash: string): string {
  const hash = shortHash.toLowerCase().replace(/[^0-9a-f]/g, '').slice(0, 8) || '00000000';
  return `${isoDay(date)}_${slug(scenarioName)}_${hash}`;
}

/** The report file name: reportBaseName + ".html". */
export function reportFileName(date: string | Date, scenarioName: string, shortHash: string): string {
  return `${reportBaseName(date, scenarioName, shortHash)}.html`;
}

/**
 * Write `content` to exactly `path` (atomically); refuse with an InputError naming `option` if the file
 * exists. For outputs whose name the user chose (--csv FILE, --report FILE).
 */
export function writeExactFile(path: string, content: string | Uint8Array, option: string): void {
  if (!existsSync(dirname(path) || '.')) throw new InputError(option, `the folder of ${path} does not exist`);
  if (existsSync(path)) throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
  const temp = writeTemporary(dirname(path) || '.', basename(path), content, path);
  try {
    linkSync(temp, path);
  } catch (error) {
    if (errorCode(error) === 'EEXIST') {
      throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
    }
    if (errorCode(error) === 'ENOENT') {
      throw new InputError(option, `the folder of ${path} does not exist`);
    }
    throw fileProblem(error, path, 'cannot write') ?? error;
  } finally {
    removeQuietly(temp);
  }
}

/**
 * Replace `path` atomically (temporary file + rename): only for derived views such as an archive index, and
 * only over a file that `isOurs` recognises as one railpulse wrote (checked again just before the rename).
 */
export function replaceOwnFile(path: string, content: string, isOurs: (existing: string) => boolean, option: string): void {
  checkReplaceable(path, isOurs, option);
  const temp = writeTemporary(dirname(path) || '.', basename(path), content, path);
  try {
    checkReplaceable(path, isOurs, option);
    renameSync(temp, path);
  } catch (error) {
    removeQuietly(temp);
    throw fileProblem(error, path, 'cannot write') ?? error;
  }
}

/** Refuse to replace a file railpulse did not write (or a folder), naming it. */
export function checkReplaceable(path: string, isOurs: (existing: string) => boolean, option: string): void {
  if (!existsSync(path)) return;
  if (!statSync(path).isFile()) throw new InputError(option, `${path} is not a file; railpulse will not replace it`);
  let existing: string;
  try {
    existing = readFileSync(path, 'utf8');
  } catch (error) {
    throw fileProblem(error, path, 'cannot read') ?? error;
  }
  if (!isOurs(existing)) {
    throw new InputError(option, `${path} exists and was not written by railpulse; it is left as it is: move it away or choose another folder`);
  }
}
