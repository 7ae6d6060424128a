/**
 * IBM Plex for the PDF report, from the @fontsource packages the app already ships (WOFF files of
 * each subset: Latin, Latin Extended, Greek, Cyrillic, Cyrillic Extended, Vietnamese). pdfkit could
 * read the WOFF files, but would inflate every table again for each report; so each is unpacked once
 * into a plain TrueType file (WOFF 1.0: the same tables, zlib compressed) under
 * node_modules/.cache/wyeward-report-fonts (the system temp directory when that cannot be written),
 * and pdfkit embeds a subset of it. No network: pdfmake may open these files and nothing else (its
 * URL and local-file policies refuse the rest).
 * Each subset is its own pdfmake family; `pdfText` sets each run of letters in the family whose
 * cmap holds them. Signs none holds (∠, arrows) are written in plain characters; letters of scripts
 * no shipped font covers (Chinese, Japanese, Korean, Arabic, Hebrew, Indic…) print as "?", and the
 * report then says so on its first page (the print view shows them as written).
 */
import { mkdirSync, readFileSync, renameSync, existsSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inflateSync } from 'node:zlib';

const require = createRequire(import.meta.url);
const dir = (pkg: string) => path.join(path.dirname(require.resolve(pkg)), 'files');

const sans = dir('@fontsource/ibm-plex-sans');
const mono = dir('@fontsource/ibm-plex-mono');

/** A WOFF 1.0 font as the TrueType (sfnt) font it wraps. */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString('latin1', 0, 4) !== 'wOFF') throw new Error('not a WOFF 1.0 font');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const raw = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(raw) : Buffer.from(raw);
    if (data.length !== origLength) throw new Error('WOFF table of the wrong length');
    tables.push({ tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data });
  }
  const pad = (n: number) => (n + 3) & ~3;
  const headerLength = 12 + 16 * numTables;
  const out = Buffer.alloc(headerLength + tables.reduce((n, t) => n + pad(t.data.length), 0));
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLength;
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    out.writeUInt32BE(t.tag, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += pad(t.data.length);
  });
  return out;
}

function cacheDir(): string {
  for (const dir of [path.resolve(import.meta.dirname, '..', '..', 'node_modules', '.cache', 'wyeward-report-fonts'), path.join(tmpdir(), 'wyeward-report-fonts')]) {
    try {
      mkdirSync(dir, { recursive: true });
      return dir;
    } catch {
      // not writable: try the next
    }
  }
  throw new Error('no directory to unpack the report fonts into');
}

/** The TrueType file unpacked from a shipped WOFF file (made once, then reused). */
function ttf(woffPath: string): string {
  const file = path.join(cacheDir(), path.basename(woffPath).replace(/\.woff$/, '.ttf'));
  if (!existsSync(file)) {
    const tmp = `${file}.${process.pid}.${Math.random().toString(36).slice(2)}`;
    writeFileSync(tmp, woffToSfnt(readFileSync(woffPath)));
    renameSync(tmp, file);
  }
  return file;
}

/** The code points a TrueType font maps to glyphs (its cmap: format 4 and 12 subtables, Unicode encodings). */
export function cmapCodePoints(sfnt: Buffer): Set<number> {
  const out = new Set<number>();
  const numTables = sfnt.readUInt16BE(4);
  let cmap = -1;
  for (let i = 0; i < numTables; i++) {
    const at = 12 + i * 16;
    if (sfnt.toString('latin1', at, at + 4) === 'cmap') cmap = sfnt.readUInt32BE(at + 8);
  }
  if (cmap < 0) return out;
  const subtables = sfnt.readUInt16BE(cmap + 2);
  for (let i = 0; i < subtables; i++) {
    const platform = sfnt.readUInt16BE(cmap + 4 + i * 8);
    const encoding = sfnt.readUInt16BE(cmap + 6 + i * 8);
    if (!(platform === 0 || (platform === 3 && (encoding === 1 || encoding === 10)))) continue;
    const at = cmap + sfnt.readUInt32BE(cmap + 8 + i * 8);
    const format = sfnt.readUInt16BE(at);
    if (format === 4) {
      const segments = sfnt.readUInt16BE(at + 6) / 2;
      const ends = at + 14;
      const starts = ends + segments * 2 + 2;
      const deltas = starts + segments * 2;
      const offsets = deltas + segments * 2;
      for (let k = 0; k < segments; k++) {
        const end = sfnt.readUInt16BE(ends + k * 2);
        const start = sfnt.readUInt16BE(starts + k * 2);
        const delta = sfnt.readInt16BE(deltas + k * 2);
        const rangeOffset = sfnt.readUInt16BE(offsets + k * 2);
        for (let c = start; c <= end && c !== 0xffff; c++) {
          const glyph = rangeOffset === 0 ? (c + delta) & 0xffff : sfnt.readUInt16BE(offsets + k * 2 + rangeOffset + (c - start) * 2);
          if (glyph !== 0) out.add(c);
        }
      }
    } else if (format === 12) {
      const groups = sfnt.readUInt32BE(at + 12);
      for (let k = 0; k < groups; k++) {
        const g = at + 16 + k * 12;
        const first = sfnt.readUInt32BE(g + 4);
        for (let c = first; c <= sfnt.readUInt32BE(g); c++) if (sfnt.readUInt32BE(g + 8) + (c - first) !== 0) out.add(c);
      }
    }
  }
  return out;
}

/** The four styles of one subset of IBM Plex Sans (pdfmake's bold is the 600 weight, as on screen). */
function sansFamily(subset: string) {
  return {
    normal: ttf(path.join(sans, `ibm-plex-sans-${subset}-400-normal.woff`)),
    bold: ttf(path.join(sans, `ibm-plex-sans-${subset}-600-normal.woff`)),
    italics: ttf(path.join(sans, `ibm-plex-sans-${subset}-400-italic.woff`)),
    bolditalics: ttf(path.join(sans, `ibm-plex-sans-${subset}-600-italic.woff`)),
  };
}

/**
 * The shipped subsets of IBM Plex Sans, each a pdfmake family, in the order a letter is looked for:
 * Latin first (the report's own font, `Plex`), then Latin Extended, Greek, Cyrillic, Cyrillic
 * Extended and Vietnamese. A run of text in another subset's letters is set in that subset's family.
 */
const SUBSETS = [
  { family: 'Plex', subset: 'latin' },
  { family: 'PlexLatinExt', subset: 'latin-ext' },
  { family: 'PlexGreek', subset: 'greek' },
  { family: 'PlexCyrillic', subset: 'cyrillic' },
  { family: 'PlexCyrillicExt', subset: 'cyrillic-ext' },
  { family: 'PlexVietnamese', subset: 'vietnamese' },
] as const;

/** Font families as pdfmake takes them (absolute file paths). */
export const REPORT_FONTS: Record<string, Record<'normal' | 'bold' | 'italics' | 'bolditalics', string>> = {
  ...Object.fromEntries(SUBSETS.map(({ family, subset }) => [family, sansFamily(subset)])),
  PlexMono: {
    normal: ttf(path.join(mono, 'ibm-plex-mono-latin-400-normal.woff')),
    bold: ttf(path.join(mono, 'ibm-plex-mono-latin-400-normal.woff')),
    italics: ttf(path.join(mono, 'ibm-plex-mono-latin-400-italic.woff')),
    bolditalics: ttf(path.join(mono, 'ibm-plex-mono-latin-400-italic.woff')),
  },
};

/** Every font file the report may read. */
export const FONT_FILES: ReadonlySet<string> = new Set(Object.values(REPORT_FONTS).flatMap((f) => Object.values(f)));

/** What each subset's family draws: the code points both its regular and its bold file map (read from their cmaps). */
const COVERAGE = SUBSETS.map(({ family }) => {
  const regular = cmapCodePoints(readFileSync(REPORT_FONTS[family].normal));
  const bold = cmapCodePoints(readFileSync(REPORT_FONTS[family].bold));
  return { family, has: new Set([...regular].filter((c) => bold.has(c))) };
});

/** The family that draws a code point (null: no shipped subset has it). */
export function familyOf(cp: number): string | null {
  for (const c of COVERAGE) if (c.has.has(cp)) return c.family;
  return null;
}

/** Signs no shipped subset holds, in plain characters. */
const REPLACE: Record<string, string> = { '∠': ' at ', '√': 'sqrt', '≤': '<=', '≥': '>=', '→': '->', '▲': '(high)', '▼': '(low)', '✖': '(x)', '⚠': '(!)' };

/** A run of text in one family (no `font`: the surrounding text's own, Latin). */
export type PdfRun = { text: string; font?: string };

let unprintable = 0;

/** Starts counting the letters no shipped font can print (one report at a time: its content is built synchronously). */
export function resetUnprintable(): void {
  unprintable = 0;
}

/** How many letters since resetUnprintable() were printed as "?". */
export function unprintableCount(): number {
  return unprintable;
}

/**
 * Text the embedded fonts can draw, for pdfmake's `text`: a plain string when the Latin font draws
 * it all, else runs, each in the subset that holds its letters (Greek, Cyrillic, Vietnamese…).
 * Signs no subset holds are written in plain characters; a letter no shipped font has (Chinese,
 * Japanese, Arabic, Hebrew, Devanagari…) prints as "?" and is counted, so the report can say so.
 */
export function pdfText(s: string): string | PdfRun[] {
  const runs: PdfRun[] = [];
  for (const ch of s) {
    const cp = ch.codePointAt(0)!;
    let family = familyOf(cp);
    let text = ch;
    if (family === null) {
      const plain = REPLACE[ch];
      if (plain === undefined) unprintable += 1;
      text = plain ?? '?';
      family = 'Plex';
    }
    const font = family === 'Plex' ? undefined : family;
    const last = runs[runs.length - 1];
    if (last && last.font === font) last.text += text;
    else runs.push(font ? { text, font } : { text });
  }
  if (runs.length === 0) return '';
  return runs.length === 1 && runs[0].font === undefined ? runs[0].text : runs;
}
