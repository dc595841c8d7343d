import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';

/** Clock ticks per second of /proc's CPU counters. */
const TICK_HZ = Number(execFileSync('getconf', ['CLK_TCK']).toString().trim()) || 100;

/** CPU seconds (user + system) a live process has used so far, from /proc/<pid>/stat; 0 if gone. */
export function processCpu_s(pid: number | undefined): number {
  if (pid === undefined) return 0;
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Fields after the command name (which may hold spaces) in parentheses: utime is the 12th, stime the 13th.
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(f[11]) + Number(f[12])) / TICK_HZ;
  } catch {
    return 0;
  }
}

/** CPU seconds the whole machine has spent busy (every state but idle and iowait), from /proc/stat. */
export function machineBusy_s(): number {
  const f = readFileSync('/proc/stat', 'utf8').split('\n', 1)[0]!.trim().split(/\s+/).slice(1).map(Number);
  const [user, nice, system, , , irq, softirq, steal] = f;
  return (user! + nice! + system! + irq! + softirq! + steal!) / TICK_HZ;
}
