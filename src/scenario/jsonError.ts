/**
 * Where a JSON text goes wrong. Node's JSON.parse does not always report a position, and a person fixing a
 * scenario needs the line and column: this small scanner walks the JSON grammar (RFC 8259) and returns the
 * offset and a description of the first error.
 */
export interface JsonProblem {
  offset: number;
  message: string;
}

export function findJsonError(text: string): JsonProblem | null {
  let at = 0;
  const fail = (message: string): never => {
    throw { offset: at, message } satisfies JsonProblem;
  };
  const space = () => {
    while (at < text.length && ' \t\n\r'.includes(text[at]!)) at++;
  };
  const describe = () => (at >= text.length ? 'end of file' : `"${text[at]}"`);
  const literal = (word: string) => {
    if (text.startsWith(word, at)) at += word.length;
    else fail(`unexpected ${describe()}`);
  };
  const string = () => {
    at++;
    while (at < text.length && text[at] !== '"') {
      if (text[at] === '\\') {
        at++;
        if (text[at] === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(at + 1, at + 5))) fail('bad \\u escape in a string');
          at += 4;
        } else if (!'"\\/bfnrt'.includes(text[at] ?? '')) fail('bad escape in a string');
      } else if (text.charCodeAt(at) < 0x20) fail('unescaped control character (a line break?) inside a string');
      at++;
    }
    if (at >= text.length) fail('unterminated string');
    at++;
  };
  const number = () => {
    const match = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(at));
    if (!match) fail(`unexpected ${describe()}`);
    at += match![0].length;
  };
  const value = (): void => {
    space();
    const c = text[at];
    if (c === '{') return object();
    if (c === '[') return array();
    if (c === '"') return string();
    if (c === 't') return literal('true');
    if (c === 'f') return literal('false');
    if (c === 'n') return literal('null');
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return number();
    fail(at >= text.length ? 'unexpected end of file' : `unexpected ${describe()} where a value was expected`);
  };
  const object = () => {
    at++;
    space();
    if (text[at] === '}') {
      at++;
      return;
    }
    for (;;) {
      space();
      if (text[at] !== '"') fail(`expected a key in double quotes, found ${describe()}`);
      string();
      space();
      if (text[at] !== ':') fail(`expected ":" after the key, found ${describe()}`);
      at++;
      value();
      space();
      if (text[at] === ',') {
        at++;
        continue;
      }
      if (text[at] === '}') {
        at++;
        return;
      }
      fail(`expected "," or "}", found ${describe()}`);
    }
  };
  const array = () => {
    at++;
    space();
    if (text[at] === ']') {
      at++;
      return;
    }
    for (;;) {
      value();
      space();
      if (text[at] === ',') {
        at++;
        continue;
      }
      if (text[at] === ']') {
        at++;
        return;
      }
      fail(`expected "," or "]", found ${describe()}`);
    }
  };
  try {
    value();
    space();
    if (at < text.length) fail(`unexpected ${describe()} after the end of the JSON value`);
    return null;
  } catch (problem) {
    if (typeof problem === 'object' && problem !== null && 'offset' in problem) return problem as JsonProblem;
    throw problem;
  }
}
