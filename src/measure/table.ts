/**
 * A delimited text table as instruments export it: optional metadata lines, one header row, numeric rows.
 * Detects the separator (semicolon, tab or comma) and the decimal mark (a decimal comma only with a
 * semicolon or tab separator). Knows nothing about signals or units: ./csv.ts gives the columns meaning.
 * Every problem is an InputError at `file:line`.
 *
 * Streaming: the layout is detected on the first lines (up to DETECTION_LINES), then rows are parsed one
 * line at a time into a caller's buffer (`openTable`), so a ten-million-row export never exists as text
 * or as arrays of rows. `readTable` collects the rows of a small table (probe lists, tests).
 */
import { InputError } from '../core/errors.js';
import { textLines, type LineReader } from './lines.js';

export interface TableColumn {
  /** the header cell as written (quotes removed, trimmed) */
  header: string;
  /** the name part: text before a bracketed unit */
  name: string;
  /** the unit written in brackets, if any: `I [kA]` or `I (kA)` */
  unit: string | undefined;
}

export interface TableLayout {
  columns: TableColumn[];
  /** 1-based file line of the header */
  headerLine: number;
  separator: string;
  decimalComma: boolean;
}

export interface Table extends TableLayout {
  /** rows[r][c], numbers as written (no scaling, no unit conversion) */
  rows: number[][];
  /** 1-based file line of each row, for messages */
  lines: number[];
}

/** A table being read: its layout, then its rows one at a time. */
export interface TableStream extends TableLayout {
  /**
   * Parse the next data row into `into` (one number per column, as written); returns the row's 1-based
   * file line, or 0 after the last row. Blank lines are skipped.
   */
  nextRow(into: Float64Array): number;
  /** mean length in characters of the data lines seen while detecting the layout (sizes buffers) */
  typicalRowLength: number;
  /** the input's size in characters or bytes (an estimate of the row count is size / typicalRowLength) */
  size: number;
  close(): void;
}

/** Lines looked at to find the header; metadata blocks of scope exports are far shorter. */
const DETECTION_LINES = 2000;

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const COMMA_NUMBER = /^[+-]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/;
const SEPARATORS = [';', '\t', ','] as const;

/** Split one line on a separator, honouring double-quoted cells ("a;b" stays one cell). */
export function splitCells(line: string, separator: string): string[] {
  if (!line.includes('"')) return line.split(separator).map((cell) => cell.trim());
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (ch === '"') {
      if (quoted && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else quoted = !quoted;
    } else if (ch === separator && !quoted) {
      cells.push(cell.trim());
      cell = '';
    } else cell += ch;
  }
  cells.push(cell.trim());
  return cells;
}

const isNumeric = (cell: string, decimalComma: boolean): boolean => (decimalComma ? COMMA_NUMBER : NUMBER).test(cell);

const mostlyNumeric = (cells: string[], decimalComma: boolean): boolean =>
  cells.filter((c) => isNumeric(c, decimalComma)).length * 2 > cells.length;

/** Drop one empty cell left by a trailing separator (`1.0,2.0,`), which some instruments write. */
function withoutTrailingEmpty(cells: string[]): string[] {
  return cells.length > 1 && cells[cells.length - 1] === '' ? cells.slice(0, -1) : cells;
}

/** A decimal comma shows in some cell of the first rows (the first may hold only integers). */
function usesDecimalComma(rows: string[], separator: string): boolean {
  return rows.some((line) => splitCells(line, separator).some((cell) => cell.includes(',') && COMMA_NUMBER.test(cell)));
}

interface Layout {
  separator: string;
  decimalComma: boolean;
  headerIndex: number;
}

/**
 * The header is the first row of at least two cells, most of them not numbers, followed by a row that is
 * mostly numbers. Separators are tried semicolon first: a comma file has no semicolons and falls through,
 * while a semicolon file with decimal commas would split wrongly on commas.
 */
function detectLayout(lines: string[]): Layout | undefined {
  for (const separator of SEPARATORS) {
    for (let index = 0; index < lines.length; index++) {
      if (lines[index]!.trim() === '') continue;
      const cells = withoutTrailingEmpty(splitCells(lines[index]!, separator));
      // a header is mostly text whichever the decimal mark; checking this first keeps a headerless file linear
      if (cells.length < 2 || mostlyNumeric(cells, false) || mostlyNumeric(cells, true)) continue;
      let next = index + 1;
      while (next < lines.length && lines[next]!.trim() === '') next++;
      if (next >= lines.length) break;
      const nextCells = withoutTrailingEmpty(splitCells(lines[next]!, separator));
      if (nextCells.length < 2) continue;
      const decimalComma = separator !== ',' && usesDecimalComma(lines.slice(next, next + 200), separator);
      if (mostlyNumeric(nextCells, decimalComma)) return { separator, decimalComma, headerIndex: index };
    }
  }
  return undefined;
}

/** Parse a bracketed unit off a header: `V_breech [kV]`, `t (us)`. */
export function splitHeader(header: string): TableColumn {
  const match = /^(.*?)\s*[[(]([^\])]*)[\])]\s*$/.exec(header);
  if (!match) return { header, name: header, unit: undefined };
  const unit = match[2]!.trim();
  return { header, name: match[1]!.trim(), unit: unit === '' ? undefined : unit };
}

const describeSeparator = (separator: string): string => (separator === '\t' ? 'tab' : `"${separator}"`);

/** Open a table on a line reader: detect its layout on the first lines, then hand out rows one by one. */
export function openTable(reader: LineReader, source: string): TableStream {
  const head: string[] = [];
  for (let line = reader.next(); line !== null; line = reader.next()) {
    head.push(line);
    if (head.length >= DETECTION_LINES) break;
  }
  const layout = detectLayout(head);
  if (!layout) {
    reader.close();
    throw new InputError(`${source}:1`, 'no header row followed by numeric rows (expected e.g. "t [us],I [kA]" then numbers, separated by "," or ";")');
  }
  const { separator, decimalComma, headerIndex } = layout;
  const columns = withoutTrailingEmpty(splitCells(head[headerIndex]!, separator)).map(splitHeader);
  columns.forEach((column, c) => {
    if (column.name === '') {
      reader.close();
      throw new InputError(`${source}:${headerIndex + 1}`, `column ${c + 1} has an empty header`);
    }
  });
  let dataCharacters = 0;
  let dataLines = 0;
  for (let index = headerIndex + 1; index < head.length; index++) {
    dataCharacters += head[index]!.length + 1;
    dataLines++;
  }
  let headIndex = headerIndex + 1;
  /** the 1-based line of the text nextText() returned last */
  let lineNumber = 0;
  const nextText = (): string | null => {
    if (headIndex < head.length) {
      const text = head[headIndex]!;
      headIndex++;
      lineNumber = headIndex;
      return text;
    }
    const text = reader.next();
    lineNumber = reader.line;
    return text;
  };
  const count = columns.length;
  const numberPattern = decimalComma ? COMMA_NUMBER : NUMBER;
  /**
   * The common row, read without building an array of cells: no quotes, `count` numeric cells (a trailing
   * separator allowed). Returns false for anything else, which the careful path below reads or reports.
   */
  const quickRow = (text: string, into: Float64Array): boolean => {
    if (text.includes('"')) return false;
    let start = 0;
    for (let c = 0; c < count; c++) {
      let end = text.indexOf(separator, start);
      if (end < 0) end = text.length;
      else if (c === count - 1 && end !== text.length - 1) return false;
      let cell = text.slice(start, end);
      if (cell.charCodeAt(0) <= 32 || cell.charCodeAt(cell.length - 1) <= 32) cell = cell.trim();
      if (!numberPattern.test(cell)) return false;
      const value = Number(decimalComma ? cell.replace(',', '.') : cell);
      if (!Number.isFinite(value)) return false;
      into[c] = value;
      start = end + 1;
    }
    return start >= text.length;
  };
  const parseRow = (text: string, line: number, into: Float64Array): void => {
    if (quickRow(text, into)) return;
    const where = `${source}:${line}`;
    const cells = withoutTrailingEmpty(splitCells(text, separator));
    if (cells.length !== count) {
      throw new InputError(where, `expected ${count} cells separated by ${describeSeparator(separator)} like the header on line ${headerIndex + 1}, found ${cells.length}`);
    }
    for (let c = 0; c < count; c++) {
      const cell = cells[c]!;
      const header = columns[c]!.header;
      if (cell === '') throw new InputError(where, `empty cell in column "${header}"`);
      if (!isNumeric(cell, decimalComma)) {
        const mark = decimalComma ? 'a decimal comma' : 'a decimal point';
        throw new InputError(where, `expected a number with ${mark} in column "${header}", found "${cell.length > 40 ? `${cell.slice(0, 40)}…` : cell}"`);
      }
      const value = Number(decimalComma ? cell.replace(',', '.') : cell);
      if (!Number.isFinite(value)) throw new InputError(where, `number "${cell}" in column "${header}" is out of range`);
      into[c] = value;
    }
  };
  return {
    columns,
    headerLine: headerIndex + 1,
    separator,
    decimalComma,
    typicalRowLength: dataLines > 0 ? dataCharacters / dataLines : 16,
    size: reader.size,
    close: () => reader.close(),
    nextRow(into: Float64Array): number {
      for (let text = nextText(); text !== null; text = nextText()) {
        if (text.length === 0 || text.trim() === '') continue;
        try {
          parseRow(text, lineNumber, into);
        } catch (error) {
          reader.close();
          throw error;
        }
        return lineNumber;
      }
      return 0;
    },
  };
}

/** Read a whole (small) table held as text. `source` names the file in messages. */
export function readTable(text: string, source: string): Table {
  const stream = openTable(textLines(text, source), source);
  const rows: number[][] = [];
  const lines: number[] = [];
  const row = new Float64Array(stream.columns.length);
  for (let line = stream.nextRow(row); line > 0; line = stream.nextRow(row)) {
    rows.push(Array.from(row));
    lines.push(line);
  }
  const { columns, headerLine, separator, decimalComma } = stream;
  return { columns, rows, lines, headerLine, separator, decimalComma };
}
