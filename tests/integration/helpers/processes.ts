// Spawning and stopping the real Tidewell processes (and other binaries) from tests and the
// bench. Output is captured line by line so a test can wait for a log line; set
// TW_TEST_VERBOSE=1 to echo it. Every process started here is stopped by stopAll(), by pid.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";

export const REPO_ROOT = path.resolve(import.meta.dirname, "..", "..", "..");

export interface ManagedProcess {
  readonly name: string;
  readonly pid: number;
  readonly child: ChildProcess;
  /** Every line written to stdout or stderr so far. */
  readonly lines: string[];
  /** Resolves with the exit code (null when killed by a signal) once the process has exited. */
  readonly exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  readonly running: boolean;
  /** Waits for a line matching `pattern` (already printed or still to come). */
  waitForLine(pattern: RegExp, timeoutMs?: number): Promise<RegExpMatchArray>;
  /** Sends a signal (SIGKILL for a crash). */
  kill(signal?: NodeJS.Signals): void;
  /** SIGTERM, then SIGKILL after `graceMs`; resolves when it has exited. */
  stop(graceMs?: number): Promise<void>;
  output(): string;
}

const live = new Set<ManagedProcess>();

export interface SpawnOptions {
  env?: Record<string, string | undefined>;
  cwd?: string;
}

/**
 * Runs a TypeScript entry point of this repository with tsx, in one process (no wrapper, so
 * a signal reaches it directly). TW_NODE_ARGS adds node flags, e.g. "--cpu-prof".
 */
export function spawnTsx(name: string, script: string, args: string[] = [], opts: SpawnOptions = {}): ManagedProcess {
  const nodeArgs = (process.env.TW_NODE_ARGS ?? "").split(" ").filter(Boolean);
  return spawnProcess(name, process.execPath, [...nodeArgs, "--import", "tsx", script, ...args], opts);
}

export function spawnProcess(name: string, command: string, args: string[], opts: SpawnOptions = {}): ManagedProcess {
  const child = spawn(command, args, {
    cwd: opts.cwd ?? REPO_ROOT,
    env: { ...process.env, ...opts.env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  if (child.pid === undefined) throw new Error(`${name}: could not start ${command}`);
  const lines: string[] = [];
  const watchers = new Set<(line: string) => void>();
  const verbose = process.env.TW_TEST_VERBOSE === "1";
  const onData = (stream: NodeJS.ReadableStream) => {
    let buf = "";
    stream.setEncoding("utf8");
    stream.on("data", (chunk: string) => {
      buf += chunk;
      let i: number;
      while ((i = buf.indexOf("\n")) >= 0) {
        const line = buf.slice(0, i);
        buf = buf.slice(i + 1);
        lines.push(line);
        if (lines.length > 20_000) lines.splice(0, 10_000);
        if (verbose) console.log(`  ${name} | ${line}`);
        for (const w of watchers) w(line);
      }
    });
  };
  onData(child.stdout!);
  onData(child.stderr!);
  let running = true;
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
    child.on("exit", (code, signal) => {
      running = false;
      live.delete(proc);
      resolve({ code, signal });
    });
  });
  const proc: ManagedProcess = {
    name,
    pid: child.pid,
    child,
    lines,
    exited,
    get running() {
      return running;
    },
    waitForLine(pattern, timeoutMs = 30_000) {
      for (const line of lines) {
        const m = line.match(pattern);
        if (m) return Promise.resolve(m);
      }
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => {
          watchers.delete(watch);
          reject(new Error(`${name}: no line matching ${pattern} within ${timeoutMs} ms; output:\n${tail(lines)}`));
        }, timeoutMs);
        const watch = (line: string) => {
          const m = line.match(pattern);
          if (!m) return;
          clearTimeout(timer);
          watchers.delete(watch);
          resolve(m);
        };
        watchers.add(watch);
        void exited.then(({ code, signal }) => {
          if (!watchers.has(watch)) return;
          clearTimeout(timer);
          watchers.delete(watch);
          reject(new Error(`${name} exited (code ${code}, signal ${signal}) before printing ${pattern}; output:\n${tail(lines)}`));
        });
      });
    },
    kill(signal = "SIGTERM") {
      if (running) process.kill(child.pid!, signal);
    },
    async stop(graceMs = 5000) {
      if (!running) return;
      process.kill(child.pid!, "SIGTERM");
      const timer = setTimeout(() => running && process.kill(child.pid!, "SIGKILL"), graceMs);
      await exited;
      clearTimeout(timer);
    },
    output: () => lines.join("\n"),
  };
  live.add(proc);
  return proc;
}

function tail(lines: string[], n = 40): string {
  return lines.slice(-n).join("\n");
}

/** Stops every process started through this module that is still running. */
export async function stopAll(): Promise<void> {
  await Promise.all([...live].map((p) => p.stop()));
}
