/**
 * The lean start of `solve` (launcher.cjs loads this bundle before the full one): `--json` of a
 * primitive-only file by the typed path (printedPrimitiveResultOfText, shared/engine/typed), with
 * nothing else loaded: no zod, no schemas, no building blocks, no general solver. Its bundle is
 * about a tenth of the full CLI's, so a file the typed path takes never pays for loading the rest.
 *
 * main(argv) prints the result (and `--timings`) and returns undefined when it took the run;
 * otherwise it returns what the full CLI (solve.ts, main(argv, handOver)) needs to carry on
 * without doing the same work twice: the file's text when it read it. It takes only
 * `<file> --json [--timings]`; any other arguments, a file it cannot read (the full CLI then
 * reports it with its message and exit code) or a file the typed path declines go to the full CLI.
 * Same bytes as the full CLI in every case (tests/server/cli/solve-launcher.test.ts).
 */
import { readText } from './read-text.ts';
import { printedPrimitiveResultOfText } from '../../shared/engine/typed/printed-scanned.ts';
import { writePrintedResult } from './printed-write.ts';
import { printTimings } from './timings.ts';
import { writeOut } from './stdout.ts';

/** What the lean start hands to the full CLI: the file's text when it has read it. */
export interface HandOver {
  text?: string;
}

export function main(argv: string[]): HandOver | undefined {
  const t0 = performance.now();
  let file: string | undefined;
  let asJson = false;
  let timings = false;
  for (const a of argv) {
    if (a === '--json') asJson = true;
    else if (a === '--timings') timings = true;
    else if (a.startsWith('--') || file !== undefined) return {}; // anything else: the full CLI
    else file = a;
  }
  if (!asJson || file === undefined) return {};
  let text: string;
  try {
    text = readText(file);
  } catch {
    return {}; // the full CLI reports it
  }
  const marks: [string, number][] = [['read', performance.now()]];
  let printed: ReturnType<typeof printedPrimitiveResultOfText>;
  try {
    printed = printedPrimitiveResultOfText(text, (stage) => marks.push([stage === 'scan' ? 'scan (parse + validate)' : 'solve', performance.now()]));
  } catch {
    printed = undefined; // never expected; the general path then reports in its own words
  }
  if (!printed) return { text };
  writePrintedResult(printed, writeOut);
  marks.push(['results + JSON write', performance.now()]);
  if (timings) printTimings(t0, marks);
  return undefined;
}
