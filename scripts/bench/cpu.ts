// CPU time a process has used (user + system), from /proc on Linux; null elsewhere. The bench
// reports CPU per reading per process, which says where the time goes even on a busy machine.
import fs from "node:fs";

const TICKS_PER_S = 100; // USER_HZ on Linux

export function cpuSeconds(pid: number): number | null {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return (Number(fields[11]) + Number(fields[12])) / TICKS_PER_S; // utime, stime
  } catch {
    return null;
  }
}
