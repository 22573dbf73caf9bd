/**
 * A delimited text table as instruments export it: optional metadata lines, one header row, numeric rows.
 * Detects the separator (semicolon, tab or comma) and the decimal mark (a decimal comma only with a
 * semicolon or tab separator). Knows nothing about signals or units: ./csv.ts gives the columns meaning.
 * Every problem is an InputError at `file:line`.
 */
import { InputError } from '../core/errors.js';

export interface TableColumn {
  /** the header cell as written (quotes removed, trimmed) */
  header: string;
  /** the name part: text before a bracketed unit */
  name: string;
  /** the unit written in brackets, if any: `I [kA]` or `I (kA)` */
  unit: string | undefined;
}

export interface Table {
  columns: TableColumn[];
  /** rows[r][c], numbers as written (no scaling, no unit conversion) */
  rows: number[][];
  /** 1-based file line of each row, for messages */
  lines: number[];
  /** 1-based file line of the header */
  headerLine: number;
  separator: string;
  decimalComma: boolean;
}

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

/** Read the table. `source` names the file in messages. */
export function readTable(text: string, source: string): Table {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  const layout = detectLayout(lines);
  if (!layout) {
    throw new InputError(`${source}:1`, 'no header row followed by numeric rows (expected e.g. "t [us],I [kA]" then numbers, separated by "," or ";")');
  }
  const { separator, decimalComma, headerIndex } = layout;
  const columns = withoutTrailingEmpty(splitCells(lines[headerIndex]!, separator)).map(splitHeader);
  columns.forEach((column, c) => {
    if (column.name === '') throw new InputError(`${source}:${headerIndex + 1}`, `column ${c + 1} has an empty header`);
  });
  const rows: number[][] = [];
  const rowLines: number[] = [];
  for (let index = headerIndex + 1; index < lines.length; index++) {
    const line = lines[index]!;
    if (line.trim() === '') continue;
    const where = `${source}:${index + 1}`;
    const cells = withoutTrailingEmpty(splitCells(line, separator));
    if (cells.length !== columns.length) {
      throw new InputError(where, `expected ${columns.length} cells separated by ${describeSeparator(separator)} like the header on line ${headerIndex + 1}, found ${cells.length}`);
    }
    rows.push(
      cells.map((cell, c) => {
        const header = columns[c]!.header;
        if (cell === '') throw new InputError(where, `empty cell in column "${header}"`);
        if (!isNumeric(cell, decimalComma)) {
          const mark = decimalComma ? 'a decimal comma' : 'a decimal point';
          throw new InputError(where, `expected a number with ${mark} in column "${header}", found "${cell}"`);
        }
        const value = Number(decimalComma ? cell.replace(',', '.') : cell);
        if (!Number.isFinite(value)) throw new InputError(where, `number "${cell}" in column "${header}" is out of range`);
        return value;
      }),
    );
    rowLines.push(index + 1);
  }
  return { columns, rows, lines: rowLines, headerLine: headerIndex + 1, separator, decimalComma };
}
