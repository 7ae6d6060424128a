/**
 * IBM Plex for the PDF report, from the @fontsource packages the app already ships (WOFF files of
 * the Latin subset; pdfkit embeds WOFF as a TrueType subset). No network: pdfmake may open these
 * files and nothing else (its URL and local-file policies refuse the rest).
 * The Latin subset has no ∠, Ω or arrows: `pdfText` writes those in plain characters.
 */
import { createRequire } from 'node:module';
import path from 'node:path';

const require = createRequire(import.meta.url);
const dir = (pkg: string) => path.join(path.dirname(require.resolve(pkg)), 'files');

const sans = dir('@fontsource/ibm-plex-sans');
const mono = dir('@fontsource/ibm-plex-mono');

/** Font families as pdfmake takes them (absolute file paths). */
export const REPORT_FONTS = {
  Plex: {
    normal: path.join(sans, 'ibm-plex-sans-latin-400-normal.woff'),
    bold: path.join(sans, 'ibm-plex-sans-latin-600-normal.woff'),
    italics: path.join(sans, 'ibm-plex-sans-latin-400-italic.woff'),
    bolditalics: path.join(sans, 'ibm-plex-sans-latin-600-italic.woff'),
  },
  PlexMono: {
    normal: path.join(mono, 'ibm-plex-mono-latin-400-normal.woff'),
    bold: path.join(mono, 'ibm-plex-mono-latin-400-normal.woff'),
    italics: path.join(mono, 'ibm-plex-mono-latin-400-italic.woff'),
    bolditalics: path.join(mono, 'ibm-plex-mono-latin-400-italic.woff'),
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
