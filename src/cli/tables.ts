/**
 * Result tables for the analysis commands: CSV (RFC 4180: comma separated,
 * fields with a comma, quote or line break quoted, quotes doubled; CRLF
 * line ends), JSON (rows as objects keyed by column) and plain text aligned
 * for the terminal. Numbers are written in full in CSV and JSON and to
 * 4 significant digits on screen; a missing value is an empty CSV field,
 * null in JSON and "–" on screen. Never NaN: a non-finite number is refused.
 */
export type Cell = number | string | boolean | null;

export interface Column {
  key: string;
  /** Unit of the column's numbers, e.g. "dB SPL"; shown in JSON and on screen. */
  unit?: string;
}

export interface Table {
  name: string;
  columns: Column[];
  rows: Cell[][];
}

function checkCell(value: Cell, table: Table, column: string): void {
  if (typeof value === 'number' && !Number.isFinite(value)) {
    throw new Error(`table ${table.name}, column ${column}: ${value} is not a finite number (a bug in glowtalk)`);
  }
}

function csvField(value: Cell): string {
  if (value === null) return '';
  const text = typeof value === 'number' ? String(value) : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(table: Table): string {
  const lines = [table.columns.map((c) => csvField(c.key)).join(',')];
  for (const row of table.rows) {
    row.forEach((cell, i) => checkCell(cell, table, table.columns[i]?.key ?? String(i)));
    lines.push(row.map(csvField).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

export interface JsonTable {
  name: string;
  columns: Column[];
  rows: Array<Record<string, Cell>>;
}

export function toJsonTable(table: Table): JsonTable {
  return {
    name: table.name,
    columns: table.columns,
    rows: table.rows.map((row) => {
      const out: Record<string, Cell> = {};
      table.columns.forEach((column, i) => {
        checkCell(row[i], table, column.key);
        out[column.key] = row[i] ?? null;
      });
      return out;
    }),
  };
}

/** A number for the screen: 4 significant digits, no exponent for ordinary magnitudes. */
export function formatNumber(value: number): string {
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-3) return value.toExponential(3);
  if (Number.isInteger(value)) return String(value);
  return String(Number(value.toPrecision(4)));
}

/** Columns padded to their widest cell; at most `maxRows` rows, then a line saying how many more. */
export function toText(table: Table, maxRows = 40): string {
  const header = table.columns.map((c) => (c.unit ? `${c.key} (${c.unit})` : c.key));
  const shown = table.rows.slice(0, maxRows).map((row) => row.map((cell) => (cell === null ? '–' : typeof cell === 'number' ? formatNumber(cell) : String(cell))));
  const widths = header.map((h, i) => Math.max(h.length, ...shown.map((row) => (row[i] ?? '').length)));
  const line = (cells: string[]) => cells.map((cell, i) => cell.padStart(widths[i])).join('  ').trimEnd();
  const lines = [line(header), ...shown.map(line)];
  if (table.rows.length > maxRows) lines.push(`… ${table.rows.length - maxRows} more rows in ${table.name}.csv`);
  return `${lines.join('\n')}\n`;
}
