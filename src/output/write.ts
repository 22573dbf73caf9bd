/**
 * Writing generated files: atomically (a reader never sees half a report) and never over an existing
 * file. The content goes to a temporary file in the target directory, which is then hard-linked to the
 * final name; link() fails with EEXIST instead of replacing, so a collision picks the next free name.
 */
import { randomBytes } from 'node:crypto';
import { closeSync, existsSync, fsyncSync, linkSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../core/errors.js';

const MAX_SUFFIX = 10_000;

function writeTemporary(dir: string, baseName: string, content: string | Uint8Array): string {
  // A random temporary name avoids colliding with a concurrent writer; it never reaches the final name.
  const temp = join(dir, `.${baseName}.${process.pid}.${randomBytes(6).toString('hex')}.tmp`);
  const fd = openSync(temp, 'wx', 0o644);
  try {
    writeSync(fd, typeof content === 'string' ? Buffer.from(content, 'utf8') : content);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  return temp;
}

/**
 * Write `content` to `dir/baseName.ext`, or `dir/baseName-2.ext`, `-3` … if taken. Returns the path
 * written. Never replaces an existing file.
 */
export function writeNewFile(dir: string, baseName: string, ext: string, content: string | Uint8Array): string {
  const extension = ext === '' || ext.startsWith('.') ? ext : `.${ext}`;
  const temp = writeTemporary(dir, baseName, content);
  try {
    for (let n = 1; n <= MAX_SUFFIX; n++) {
      const candidate = join(dir, `${baseName}${n === 1 ? '' : `-${n}`}${extension}`);
      try {
        linkSync(temp, candidate);
        return candidate;
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      }
    }
    throw new Error(`no free file name for ${baseName}${extension} in ${dir} after ${MAX_SUFFIX} tries`);
  } finally {
    unlinkSync(temp);
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
  const temp = writeTemporary(dirname(path), basename(path), content);
  try {
    linkSync(temp, path);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') {
      throw new InputError(option, `${path} exists; railpulse never overwrites a file, choose another name`);
    }
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') {
      throw new InputError(option, `the folder of ${path} does not exist`);
    }
    throw error;
  } finally {
    unlinkSync(temp);
  }
}

/** Replace `path` atomically (temporary file + rename): only for derived views such as an archive index. */
export function replaceFile(path: string, content: string): void {
  const temp = writeTemporary(dirname(path), basename(path), content);
  renameSync(temp, path);
}
