// CPU seconds used by processes (utime + stime from /proc), so that a benchmark on a shared machine can
// report what each reading costs in CPU, a figure that other load on the machine disturbs much less
// than throughput.
import { readdirSync, readFileSync } from 'node:fs';

const TICK = 100; // USER_HZ on Linux

function stat(pid) {
  try {
    const s = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const f = s.slice(s.lastIndexOf(')') + 2).split(' ');
    // fields after the command: state(0) ppid(1) … utime(11) stime(12) cutime(13) cstime(14)
    return { ppid: Number(f[1]), cpu: (Number(f[11]) + Number(f[12]) + Number(f[13]) + Number(f[14])) / TICK };
  } catch {
    return null;
  }
}

/** CPU seconds of `pid` (with its reaped children). */
export function cpuOf(pid) {
  return stat(pid)?.cpu ?? 0;
}

/** CPU seconds of the postmaster `pid` and all its live backends, by pid (backends come and go). */
export function pgCpu(postmasterPid) {
  const out = new Map([[postmasterPid, cpuOf(postmasterPid)]]);
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    const s = stat(Number(name));
    if (s && s.ppid === postmasterPid) out.set(Number(name), s.cpu);
  }
  return out;
}

/** CPU seconds between two pgCpu snapshots (backends that ended in between count in the postmaster's cutime). */
export function pgCpuDelta(a, b) {
  let d = 0;
  for (const [pid, cpu] of b) d += cpu - (a.get(pid) ?? 0);
  return d;
}

/** Busy and total CPU seconds of the whole machine from /proc/stat. */
export function machineCpu() {
  const line = readFileSync('/proc/stat', 'utf8').split('\n')[0].trim().split(/\s+/).slice(1).map(Number);
  const idle = line[3] + line[4];
  const total = line.reduce((a, b) => a + b, 0);
  return { busy: (total - idle) / TICK, total: total / TICK };
}
