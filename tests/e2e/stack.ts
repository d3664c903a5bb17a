// Starts the project's own processes for end-to-end tests, each on a free loopback port.
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import fs from "node:fs";
import path from "node:path";

export const ROOT = path.resolve(import.meta.dirname, "../..");

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
    srv.on("error", reject);
  });
}

export interface Proc {
  name: string;
  child: ChildProcess;
  log: string;
}

export function startProcess(name: string, cmd: string, args: string[], env: Record<string, string>, logDir: string): Proc {
  const logFile = path.join(logDir, `${name}.log`);
  const out = fs.openSync(logFile, "a");
  const child = spawn(cmd, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: ["ignore", out, out], detached: true });
  return { name, child, log: logFile };
}

export function stopProcess(p: Proc, signal: NodeJS.Signals = "SIGTERM") {
  if (p.child.exitCode !== null || p.child.pid === undefined) return;
  try {
    process.kill(-p.child.pid, signal); // the whole process group (tsx and next spawn children)
  } catch {
    /* already gone */
  }
}

export async function waitFor(what: string, check: () => Promise<boolean>, timeoutMs = 60_000, everyMs = 250): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      if (await check()) return;
    } catch {
      /* not yet */
    }
    await new Promise((r) => setTimeout(r, everyMs));
  }
  throw new Error(`Timed out waiting for ${what}`);
}

export async function waitForHttp(url: string, timeoutMs = 60_000) {
  await waitFor(url, async () => (await fetch(url, { redirect: "manual" })).status < 500, timeoutMs);
}
