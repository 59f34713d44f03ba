/**
 * CSV as RFC 4180 describes it: CRLF line ends, a header line, and a field in
 * double quotes (inner quotes doubled) whenever it holds a comma, a quote, CR
 * or LF. Numbers are written with JavaScript's shortest round-trip form, so a
 * reader gets back exactly the number in the JSON downloads; null is empty.
 */
export type CsvValue = string | number | boolean | null | undefined;

export function csvField(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One row's line, without the line end. */
export function csvLine<T>(columns: ReadonlyArray<keyof T & string>, row: T): string {
  return columns.map((c) => csvField(row[c] as CsvValue)).join(",");
}

/** The file from its lines: the header, then the rows' lines (csvLine). */
export function csvFromLines(columns: readonly string[], lines: readonly string[]): string {
  return [...csvChunks(columns, lines)].join("");
}

/** That text in pieces, one line (with its CRLF) each. */
export function* csvChunks(columns: readonly string[], lines: readonly string[]): Generator<string> {
  yield columns.map((c) => csvField(c)).join(",") + "\r\n";
  for (const line of lines) yield line + "\r\n";
}

export function toCsv<T>(columns: ReadonlyArray<keyof T & string>, rows: readonly T[]): string {
  return csvFromLines(columns, rows.map((row) => csvLine(columns, row)));
}
