/**
 * A strict reader of RFC 4180 CSV (Shafranovich 2005, section 2): CRLF line
 * ends, fields optionally in double quotes, inner quotes doubled, commas and
 * line breaks only inside quoted fields. Anything else throws, so a test that
 * reads a file with it also checks the file's form.
 */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let i = 0;
  const n = text.length;
  if (n === 0) return rows;
  for (;;) {
    let field = "";
    if (text[i] === '"') {
      i++;
      for (;;) {
        if (i >= n) throw new Error("unterminated quoted field");
        const c = text[i];
        if (c === '"') {
          if (text[i + 1] === '"') {
            field += '"';
            i += 2;
          } else {
            i++;
            break;
          }
        } else {
          field += c;
          i++;
        }
      }
      if (i < n && text[i] !== "," && text[i] !== "\r") throw new Error(`text after a closing quote at ${i}`);
    } else {
      while (i < n && text[i] !== "," && text[i] !== "\r") {
        const c = text[i];
        if (c === '"' || c === "\n") throw new Error(`bare ${JSON.stringify(c)} in an unquoted field at ${i}`);
        field += c;
        i++;
      }
    }
    row.push(field);
    if (i >= n) throw new Error("the last line has no CRLF");
    if (text[i] === ",") {
      i++;
      continue;
    }
    if (text[i] === "\r" && text[i + 1] === "\n") {
      rows.push(row);
      row = [];
      i += 2;
      if (i >= n) return rows;
      continue;
    }
    throw new Error(`bare CR at ${i}`);
  }
}
