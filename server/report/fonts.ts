/**
 * IBM Plex for the PDF report, from the @fontsource packages the app already ships (WOFF files of
 * the Latin subset). pdfkit could read the WOFF files, but would inflate every table again for each
 * report; so each is unpacked once into a plain TrueType file (WOFF 1.0: the same tables, zlib
 * compressed) under node_modules/.cache/wyeward-report-fonts (the system temp directory when that
 * cannot be written), and pdfkit embeds a subset of it. No network: pdfmake may open these files
 * and nothing else (its URL and local-file policies refuse the rest).
 * The Latin subset has no ∠, Ω or arrows: `pdfText` writes those in plain characters.
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

/** Font families as pdfmake takes them (absolute file paths). */
export const REPORT_FONTS = {
  Plex: {
    normal: ttf(path.join(sans, 'ibm-plex-sans-latin-400-normal.woff')),
    bold: ttf(path.join(sans, 'ibm-plex-sans-latin-600-normal.woff')),
    italics: ttf(path.join(sans, 'ibm-plex-sans-latin-400-italic.woff')),
    bolditalics: ttf(path.join(sans, 'ibm-plex-sans-latin-600-italic.woff')),
  },
  PlexMono: {
    normal: ttf(path.join(mono, 'ibm-plex-mono-latin-400-normal.woff')),
    bold: ttf(path.join(mono, 'ibm-plex-mono-latin-400-normal.woff')),
    italics: ttf(path.join(mono, 'ibm-plex-mono-latin-400-italic.woff')),
    bolditalics: ttf(path.join(mono, 'ibm-plex-mono-latin-400-italic.woff')),
  },
};

/** Every font file the report may read. */
export const FONT_FILES: ReadonlySet<string> = new Set(Object.values(REPORT_FONTS).flatMap((f) => Object.values(f)));

/** Characters outside the Latin subset, in plain characters. */
const REPLACE: Record<string, string> = { '∠': ' at ', 'Ω': 'ohm', '√': 'sqrt', '≤': '<=', '≥': '>=', '→': '->', 'Δ': 'delta ', '▲': '(high)', '▼': '(low)', '✖': '(x)', '⚠': '(!)', 'π': 'pi' };

/** True for a code point the Latin subset of IBM Plex holds (the subset's published unicode-range). */
function inLatinSubset(cp: number): boolean {
  return (
    cp <= 0xff ||
    cp === 0x131 ||
    cp === 0x152 ||
    cp === 0x153 ||
    cp === 0x2bb ||
    cp === 0x2bc ||
    cp === 0x2c6 ||
    cp === 0x2da ||
    cp === 0x2dc ||
    (cp >= 0x2000 && cp <= 0x206f) ||
    cp === 0x20ac ||
    cp === 0x2122 ||
    cp === 0x2191 ||
    cp === 0x2193 ||
    cp === 0x2212 ||
    cp === 0x2215
  );
}

/** Text the embedded font can draw: known signs in plain characters, anything else as "?". */
export function pdfText(s: string): string {
  let out = '';
  for (const ch of s) {
    const cp = ch.codePointAt(0)!;
    out += inLatinSubset(cp) ? ch : (REPLACE[ch] ?? '?');
  }
  return out;
}
