/**
 * The `--timings` line of `solve` on stderr: time since process start (node, launcher, bundle
 * loading) first, then each step. Its own module so the lean bundle (solve-lean.ts) prints it too.
 */
export function printTimings(t0: number, marks: [string, number][]): void {
  const startup = t0; // performance.now() counts from the process's time origin
  const parts = [`start-up + imports ${startup.toFixed(0)} ms`];
  let prev = t0;
  for (const [label, t] of marks) {
    parts.push(`${label} ${(t - prev).toFixed(0)} ms`);
    prev = t;
  }
  process.stderr.write(`solve timings: ${parts.join(', ')}; total ${prev.toFixed(0)} ms since process start\n`);
}
