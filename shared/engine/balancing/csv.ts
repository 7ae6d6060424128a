/**
 * A small CSV reader (RFC 4180: comma separated, fields in double quotes may hold commas, quotes
 * doubled, line breaks; CRLF or LF). Spreadsheets set to a decimal comma save with semicolons, and
 * some exports use tabs: the separator is the one the header line uses (csvDelimiter). Pure, so the
 * engine can validate a customer file wherever it runs; the browser reads files with papaparse
 * (told the same separator) before sending them, and the server reads again here.
 */

const DELIMITERS = [',', ';', '\t'] as const;
export type CsvDelimiter = (typeof DELIMITERS)[number];

/**
 * The separator of a CSV text: of comma, semicolon and tab, the one its first line (outside quoted
 * fields) holds most often; a comma when there is a tie or none.
 */
export function csvDelimiter(text: string): CsvDelimiter {
  const counts = new Map<string, number>(DELIMITERS.map((d) => [d, 0]));
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === '\n' || ch === '\r')) break;
    else if (!quoted && counts.has(ch)) counts.set(ch, counts.get(ch)! + 1);
  }
  let best: CsvDelimiter = ',';
  for (const d of DELIMITERS) if (counts.get(d)! > counts.get(best)!) best = d;
  return best;
}

/** Rows of cells; blank lines are dropped. Throws an Error naming the line of an unclosed quote. */
export function parseCsv(text: string, delimiter: CsvDelimiter = csvDelimiter(text)): string[][] {
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
    } else if (ch === delimiter) {
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
