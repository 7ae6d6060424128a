/**
 * CPU time by thread of the chromium processes a benchmark started (read from /proc: every
 * descendant process of this one whose command is chromium, each of its threads' user + system
 * time), so a run can say how the cores were shared between the page's main thread, the sweep
 * workers, the compositor, the raster threads and the GPU process. Linux only; prints, asserts nothing.
 */
import { readdirSync, readFileSync } from 'node:fs';

const TICK_MS = 10; // USER_HZ is 100 on Linux

/** Parent of every process (pid → ppid), and its command name. */
function processes(): Map<number, { ppid: number; comm: string }> {
  const out = new Map<number, { ppid: number; comm: string }>();
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const s = readFileSync(`/proc/${d}/stat`, 'utf8');
      const close = s.lastIndexOf(')');
      const comm = s.slice(s.indexOf('(') + 1, close);
      const ppid = Number(s.slice(close + 2).split(' ')[1]);
      out.set(Number(d), { ppid, comm });
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

/** The chromium process's type (--type=renderer, gpu-process, utility…; the browser itself when none). */
function kind(pid: number): string {
  try {
    const cmd = readFileSync(`/proc/${pid}/cmdline`, 'utf8');
    return /--type=([\w-]+)/.exec(cmd)?.[1] ?? 'browser';
  } catch {
    return '?';
  }
}

/** CPU ms by "process type/pid thread name" for every thread of chromium processes below this one. */
export function chromiumThreadCpu(root = process.pid): Map<string, number> {
  const procs = processes();
  const below = (pid: number) => {
    for (let p = procs.get(pid)?.ppid; p; p = procs.get(p)?.ppid) if (p === root) return true;
    return false;
  };
  const out = new Map<string, number>();
  for (const [pid, { comm }] of procs) {
    if (!/chrom/i.test(comm) || !below(pid)) continue;
    const k = kind(pid);
    let tasks: string[] = [];
    try {
      tasks = readdirSync(`/proc/${pid}/task`);
    } catch {
      continue;
    }
    for (const t of tasks) {
      try {
        const s = readFileSync(`/proc/${pid}/task/${t}/stat`, 'utf8');
        const close = s.lastIndexOf(')');
        const name = s.slice(s.indexOf('(') + 1, close);
        const f = s.slice(close + 2).split(' ');
        const ms = (Number(f[11]) + Number(f[12])) * TICK_MS;
        // per thread: threads of one name (raster workers, helpers) are summed
        const key = `${k}:${pid} ${name.replace(/\d+$/, '#')}`;
        out.set(key, (out.get(key) ?? 0) + ms);
      } catch {
        // thread ended
      }
    }
  }
  return out;
}

/** What each thread used between two readings, largest first (threads under `minMs` left out). */
export function threadCpuDelta(before: Map<string, number>, after: Map<string, number>, minMs = 20): [string, number][] {
  return [...after]
    .map(([k, v]) => [k, v - (before.get(k) ?? 0)] as [string, number])
    .filter(([, v]) => v >= minMs)
    .sort((a, b) => b[1] - a[1]);
}
