/**
 * Where a JSON text goes wrong. Node's JSON.parse does not always report a position, and a person fixing a
 * scenario needs the line and column: this small scanner walks the JSON grammar (RFC 8259) and returns the
 * offset and a description of the first error.
 *
 * It keeps the open arrays and objects on a stack of its own instead of recursing, so a file of a million
 * opening brackets is one error message, not a stack overflow; and it reports nesting deeper than a limit,
 * since no scenario needs more than a few levels and deeply nested values overflow JSON.stringify downstream.
 */
export interface JsonProblem {
  offset: number;
  message: string;
}

/** Deeper nesting than this is refused (a scenario uses at most five levels: bank[0].crowbar.drop). */
export const MAX_JSON_DEPTH = 64;

const NUMBER = /-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/y;
const HEX4 = /[0-9a-fA-F]{4}/y;

/** The first problem of a JSON text, or null when it is valid and nested no deeper than `maxDepth`. */
export function findJsonError(text: string, maxDepth = MAX_JSON_DEPTH): JsonProblem | null {
  let at = 0;
  const fail = (message: string): JsonProblem => ({ offset: at, message });
  const describe = () => (at >= text.length ? 'end of file' : `"${text[at]}"`);
  const space = () => {
    while (at < text.length && (text[at] === ' ' || text[at] === '\t' || text[at] === '\n' || text[at] === '\r')) at++;
  };
  /** Scan a string starting at its opening quote; returns a problem or null. */
  const string = (): JsonProblem | null => {
    at++;
    while (at < text.length && text[at] !== '"') {
      if (text[at] === '\\') {
        at++;
        if (text[at] === 'u') {
          HEX4.lastIndex = at + 1;
          if (!HEX4.test(text)) return fail('bad \\u escape in a string');
          at += 4;
        } else if (!'"\\/bfnrt'.includes(text[at] ?? '')) return fail('bad escape in a string');
      } else if (text.charCodeAt(at) < 0x20) return fail('unescaped control character (a line break?) inside a string');
      at++;
    }
    if (at >= text.length) return fail('unterminated string');
    at++;
    return null;
  };
  /** A scalar value at `at` (string, number, literal); returns a problem or null. */
  const scalar = (): JsonProblem | null => {
    const c = text[at];
    if (c === '"') return string();
    for (const word of ['true', 'false', 'null']) {
      if (c === word[0]) {
        if (!text.startsWith(word, at)) return fail(`unexpected ${describe()}`);
        at += word.length;
        return null;
      }
    }
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) {
      NUMBER.lastIndex = at;
      const match = NUMBER.exec(text);
      if (!match) return fail(`unexpected ${describe()}`);
      at += match[0].length;
      return null;
    }
    return fail(at >= text.length ? 'unexpected end of file' : `unexpected ${describe()} where a value was expected`);
  };

  // The open containers, innermost last: '[' or '{'.
  const open: string[] = [];
  /** what the scanner expects next */
  let want: 'value' | 'key-or-close' | 'value-or-close' | 'after-value' = 'value';
  for (;;) {
    space();
    if (want === 'value' || want === 'value-or-close') {
      if (want === 'value-or-close' && text[at] === ']') {
        at++;
        open.pop();
        want = 'after-value';
        continue;
      }
      const c = text[at];
      if (c === '[' || c === '{') {
        if (open.length >= maxDepth) return fail(`nesting deeper than ${maxDepth} levels; a scenario needs only a few`);
        open.push(c);
        at++;
        want = c === '[' ? 'value-or-close' : 'key-or-close';
        continue;
      }
      const problem = scalar();
      if (problem) return problem;
      want = 'after-value';
      continue;
    }
    if (want === 'key-or-close') {
      if (text[at] === '}') {
        at++;
        open.pop();
        want = 'after-value';
        continue;
      }
      const problem = key();
      if (problem) return problem;
      want = 'value';
      continue;
    }
    // after a value: the end of the text, or a separator or closing bracket of the innermost container
    const container = open[open.length - 1];
    if (container === undefined) {
      if (at < text.length) return fail(`unexpected ${describe()} after the end of the JSON value`);
      return null;
    }
    const close = container === '[' ? ']' : '}';
    if (text[at] === ',') {
      at++;
      if (container === '{') {
        space();
        const problem = key();
        if (problem) return problem;
      }
      want = 'value';
      continue;
    }
    if (text[at] === close) {
      at++;
      open.pop();
      continue;
    }
    return fail(`expected "," or "${close}", found ${describe()}`);
  }

  /** A key and its colon, inside an object. */
  function key(): JsonProblem | null {
    if (text[at] !== '"') return fail(`expected a key in double quotes, found ${describe()}`);
    const problem = string();
    if (problem) return problem;
    space();
    if (text[at] !== ':') return fail(`expected ":" after the key, found ${describe()}`);
    at++;
    return null;
  }
}
