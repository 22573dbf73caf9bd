/**
 * Lines of a text, read a chunk at a time: a scope export of ten million rows is never held as one string
 * or split into one array. Line ends may be LF, CRLF or a lone CR; a byte-order mark is dropped. No
 * recursion and no unbounded buffering: a "line" longer than MAX_LINE_CHARACTERS is refused with its line
 * number (a binary file or a file with no line ends would otherwise be read whole).
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { StringDecoder } from 'node:string_decoder';
import { InputError } from '../core/errors.js';

export interface LineReader {
  /** the next line without its line end, or null at the end */
  next(): string | null;
  /** 1-based number of the line last returned (0 before the first) */
  readonly line: number;
  /** size of the whole input in characters or bytes, for sizing buffers (an estimate is enough) */
  readonly size: number;
  /** release the file, if any (also done at the end) */
  close(): void;
}

/** Longer than any row an instrument writes; a longer one is a wrong file, not a long row. */
export const MAX_LINE_CHARACTERS = 1 << 20;
const CHUNK_BYTES = 1 << 20;
const LINE_END = /\r\n|\r|\n/g;

/**
 * Splits a growing buffer into lines. `more()` appends the next piece and returns false at the end.
 * A CR at the very end of the buffer waits for the next piece (it may be the first half of a CRLF).
 */
function lineSplitter(source: string, more: (append: (piece: string) => void) => boolean, size: number, close: () => void): LineReader {
  let buffer = '';
  let position = 0;
  let ended = false;
  let line = 0;
  const append = (piece: string): void => {
    buffer = position > 0 ? buffer.slice(position) + piece : buffer + piece;
    position = 0;
  };
  const tooLong = (): never => {
    close();
    throw new InputError(`${source}:${line + 1}`, `line longer than ${MAX_LINE_CHARACTERS} characters: not a delimited text export`);
  };
  return {
    get line() {
      return line;
    },
    size,
    close,
    next(): string | null {
      for (;;) {
        LINE_END.lastIndex = position;
        const match = LINE_END.exec(buffer);
        const waitForLf = match !== null && match[0] === '\r' && match.index === buffer.length - 1 && !ended;
        if (match && !waitForLf) {
          if (match.index - position > MAX_LINE_CHARACTERS) tooLong();
          let text = buffer.slice(position, match.index);
          position = match.index + match[0].length;
          if (line === 0) text = text.replace(/^\uFEFF/, '');
          line++;
          return text;
        }
        if (ended) {
          if (position >= buffer.length) return null;
          let text = buffer.slice(position);
          position = buffer.length;
          if (line === 0) text = text.replace(/^\uFEFF/, '');
          line++;
          return text;
        }
        if (buffer.length - position > MAX_LINE_CHARACTERS) tooLong();
        if (!more(append)) {
          ended = true;
          close();
        }
      }
    },
  };
}

/** Lines of a string already in memory (small files, tests). */
export function textLines(text: string, source: string): LineReader {
  let given = false;
  return lineSplitter(
    source,
    (append) => {
      if (given) return false;
      given = true;
      append(text);
      return true;
    },
    text.length,
    () => undefined,
  );
}

/** Lines of a file, read a chunk at a time (UTF-8; a character split between chunks is joined). */
export function fileLines(path: string, source: string): LineReader {
  let fd: number | null = openSync(path, 'r');
  const size = fstatSync(fd).size;
  const chunk = Buffer.allocUnsafe(CHUNK_BYTES);
  const decoder = new StringDecoder('utf8');
  const close = (): void => {
    if (fd !== null) closeSync(fd);
    fd = null;
  };
  return lineSplitter(
    source,
    (append) => {
      if (fd === null) return false;
      let bytes: number;
      try {
        bytes = readSync(fd, chunk, 0, CHUNK_BYTES, null);
      } catch (error) {
        close();
        throw new InputError(source, `cannot read the file (${(error as NodeJS.ErrnoException).code ?? 'error'})`);
      }
      if (bytes === 0) {
        const rest = decoder.end();
        if (rest) append(rest);
        return false;
      }
      append(decoder.write(chunk.subarray(0, bytes)));
      return true;
    },
    size,
    close,
  );
}
