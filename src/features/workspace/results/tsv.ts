/** Tab-separated text for the clipboard (spreadsheets paste it into cells). */

/** One line per row, cells joined by tabs; tabs and line breaks inside a cell become spaces. */
export function toTsv(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const clean = (s: string) => s.replace(/[\t\r\n]+/g, ' ');
  return [header, ...rows].map((r) => r.map(clean).join('\t')).join('\n') + '\n';
}

/** Copy text to the clipboard; false when the browser refuses (no permission, insecure context). */
export async function copyText(text: string): Promise<boolean> {
  try {
    if (typeof navigator === 'undefined' || !navigator.clipboard) return false;
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    return false;
  }
}

/** Offers `text` as a file download (a CSV of a results table); false when the browser cannot. */
export function downloadText(text: string, fileName: string, type = 'text/csv;charset=utf-8'): boolean {
  if (typeof document === 'undefined' || typeof URL.createObjectURL !== 'function') return false;
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
  return true;
}
