/**
 * The CLIs' standard output: writeOut(chunk) writes a string (as UTF-8) or bytes to file
 * descriptor 1 with fs.writeSync, whole, before it returns.
 *
 * Why not process.stdout: its first use loads node's stream classes for the kind of output (a
 * net.Socket for a pipe, a tty.WriteStream for a terminal, a SyncWriteStream for a file), which
 * measured ~10–30 ms of CPU at load ~18 on this machine (`perf stat -r 15`, a one-line script,
 * against `fs.writeSync(1, …)`), a real share of a 10-element file's run. Writing to the
 * descriptor is what process.stdout does for files and pipes on Linux anyway (synchronously).
 * Edge cases: a descriptor left non-blocking by whoever made the pipe answers EAGAIN when the pipe
 * is full, so the write waits a millisecond and goes on; a reader that has gone (EPIPE, e.g.
 * `| head`) ends the output quietly, as the shell expects, with no error line.
 */
import { writeSync } from 'node:fs';

let closed = false;
let pause: Int32Array | undefined;

export function writeOut(chunk: string | Uint8Array): void {
  if (closed) return;
  const bytes = typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : chunk;
  let at = 0;
  while (at < bytes.length) {
    try {
      at += writeSync(1, bytes, at, bytes.length - at);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'EAGAIN') Atomics.wait((pause ??= new Int32Array(new SharedArrayBuffer(4))), 0, 0, 1);
      else if (code === 'EPIPE') {
        closed = true;
        return;
      } else throw e;
    }
  }
}
