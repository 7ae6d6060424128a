/** Captures everything the server writes to stdout/stderr (and console) while a test runs, to grep it for secrets. */
import { format } from 'node:util';

export interface CapturedLog {
  text(): string;
  restore(): void;
}

export function captureLog(): CapturedLog {
  const chunks: string[] = [];
  const out = process.stdout.write.bind(process.stdout);
  const err = process.stderr.write.bind(process.stderr);
  const methods = ['log', 'info', 'warn', 'error', 'debug'] as const;
  const saved = methods.map((m) => console[m]);
  const keep = (chunk: unknown) => {
    chunks.push(typeof chunk === 'string' ? chunk : Buffer.isBuffer(chunk) ? chunk.toString('utf8') : String(chunk));
  };
  process.stdout.write = ((chunk: unknown, ...rest: unknown[]) => {
    keep(chunk);
    return (out as (...a: unknown[]) => boolean)(chunk, ...rest);
  }) as typeof process.stdout.write;
  process.stderr.write = ((chunk: unknown, ...rest: unknown[]) => {
    keep(chunk);
    return (err as (...a: unknown[]) => boolean)(chunk, ...rest);
  }) as typeof process.stderr.write;
  methods.forEach((m, i) => {
    console[m] = (...args: unknown[]) => {
      keep(`${format(...args)}\n`);
      saved[i](...args);
    };
  });
  return {
    text: () => chunks.join(''),
    restore() {
      process.stdout.write = out;
      process.stderr.write = err;
      methods.forEach((m, i) => (console[m] = saved[i]));
    },
  };
}
