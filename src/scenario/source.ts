/**
 * A scenario file's bytes → its text: bounded in size, UTF-8 (with or without the byte-order mark some editors
 * write), and nested no deeper than a scenario can be. Every problem is one InputError naming the file.
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { InputError, errorCode, fileProblem } from '../core/errors.js';
import { MAX_JSON_DEPTH } from './jsonError.js';

/** Largest scenario file read (a bank of a thousand groups with long labels is well under 1 MB). */
export const MAX_SCENARIO_BYTES = 4 * 1024 * 1024;

const BYTE_ORDER_MARK = '\uFEFF';

/** Read a scenario file's text; `what` names it in messages when it is not a plain file path. */
export function readScenarioSource(file: string): string {
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch (error) {
    if (errorCode(error) === 'ENOENT') throw new InputError('', 'no such file', file);
    if (errorCode(error) === 'EISDIR') throw new InputError('', 'is a folder; expected a scenario file (JSON)', file);
    const problem = fileProblem(error, file, 'cannot read');
    throw problem ? new InputError('', problem.problem, file) : new InputError('', `cannot read the file (${errorCode(error) ?? 'error'})`, file);
  }
  try {
    const stat = fstatSync(fd);
    if (stat.isDirectory()) throw new InputError('', 'is a folder; expected a scenario file (JSON)', file);
    if (stat.size > MAX_SCENARIO_BYTES) throw tooLarge(stat.size, file, true);
    // Read to one byte past the limit: a file that grows (or a pipe with no size) is still bounded.
    const buffer = Buffer.alloc(Math.min(MAX_SCENARIO_BYTES + 1, Math.max(stat.size, 64 * 1024) + 1));
    let length = 0;
    for (;;) {
      if (length === buffer.length) throw tooLarge(length, file, false);
      const read = readSync(fd, buffer, length, buffer.length - length, null);
      if (read === 0) break;
      length += read;
    }
    return decodeScenarioBytes(buffer.subarray(0, length), file);
  } catch (error) {
    if (error instanceof InputError) throw error;
    const problem = fileProblem(error, file, 'cannot read');
    throw problem ? new InputError('', problem.problem, file) : error;
  } finally {
    closeSync(fd);
  }
}

function tooLarge(bytes: number, file: string, exact: boolean): InputError {
  return new InputError('', `the file is ${(bytes / 1048576).toFixed(1)} MB${exact ? '' : ' or more'}; a scenario file is at most ${MAX_SCENARIO_BYTES / 1048576} MB (is it the right file?)`, file);
}

/** Bytes → text: UTF-8 only (a UTF-16 file says so), a leading byte-order mark dropped. */
export function decodeScenarioBytes(bytes: Uint8Array, file: string): string {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    throw new InputError('', 'the file is UTF-16 text; save it as UTF-8', file);
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    throw new InputError(`byte ${firstInvalidUtf8(bytes)}`, 'not UTF-8 text; save the scenario as UTF-8', file);
  }
  return withoutByteOrderMark(text);
}

/** Some editors start a UTF-8 file with U+FEFF; it is not part of the JSON. */
export function withoutByteOrderMark(text: string): string {
  return text.startsWith(BYTE_ORDER_MARK) ? text.slice(1) : text;
}

/** Offset of the first byte that is not part of a valid UTF-8 sequence (for the message). */
function firstInvalidUtf8(bytes: Uint8Array): number {
  let low = 0;
  let high = bytes.length;
  // the longest prefix a streaming decoder accepts (it may end inside a character), by bisection
  while (low < high) {
    const middle = Math.ceil((low + high) / 2);
    try {
      new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, middle), { stream: true });
      low = middle;
    } catch {
      high = middle - 1;
    }
  }
  return low + 1;
}

/** The nesting depth of a parsed JSON value, without recursion; stops counting past `limit`. */
export function nestingDepth(value: unknown, limit = MAX_JSON_DEPTH): number {
  let deepest = 0;
  const stack: [unknown, number][] = [[value, 0]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop()!;
    if (typeof node !== 'object' || node === null) continue;
    const here = depth + 1;
    if (here > deepest) deepest = here;
    if (deepest > limit) return deepest;
    const children = Array.isArray(node) ? node : Object.values(node as Record<string, unknown>);
    for (const child of children) if (typeof child === 'object' && child !== null) stack.push([child, here]);
  }
  return deepest;
}
