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
