/**
 * A small CSV reader (RFC 4180: comma separated, fields in double quotes may hold commas, quotes
 * doubled, line breaks; CRLF or LF). Pure, so the engine can validate a customer file wherever it
 * runs; the browser reads files with papaparse before sending them, and the server reads again here.
 */

/** Rows of cells; blank lines are dropped. Throws an Error naming the line of an unclosed quote. */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  let line = 1;
  let quoteLine = 0;
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // byte-order mark of spreadsheet exports
  const endRow = () => {
    row.push(cell);
    if (row.length > 1 || row[0].trim() !== '') rows.push(row);
    row = [];
    cell = '';
  };
  for (let i = 0; i < src.length; i++) {
    const ch = src[i];
    if (quoted) {
      if (ch === '"') {
        if (src[i + 1] === '"') (cell += '"'), i++;
        else quoted = false;
      } else {
        if (ch === '\n') line++;
        cell += ch;
      }
    } else if (ch === '"' && cell.trim() === '') {
      quoted = true;
      quoteLine = line;
      cell = '';
    } else if (ch === ',') {
      row.push(cell);
      cell = '';
    } else if (ch === '\n' || ch === '\r') {
      if (ch === '\r' && src[i + 1] === '\n') i++;
      line++;
      endRow();
    } else cell += ch;
  }
  if (quoted) throw new Error(`line ${quoteLine}: a quoted field is never closed (a " is missing)`);
  if (cell !== '' || row.length > 0) endRow();
  return rows;
}
