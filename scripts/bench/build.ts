// The live section runs the web server (server/main.ts), which needs a production build. A fresh clone has none,
// and a build older than the sources would measure old code: build when `.next` is missing or
// older than any source the app is built from.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { REPO_ROOT } from "../../tests/integration/helpers/processes";

const SOURCE_DIRS = ["app", "components", "lib", "db", "ingest", "public"];
const SOURCE_FILES = ["next.config.ts", "server/security-headers.ts", "package-lock.json", "postcss.config.mjs", "tailwind.config.ts", "tsconfig.json"];

function newestMtime(entry: string): number {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(entry);
  } catch {
    return 0;
  }
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = 0;
  for (const child of fs.readdirSync(entry)) newest = Math.max(newest, newestMtime(path.join(entry, child)));
  return newest;
}

/** Why the build must be (re)made, or null when `.next` is current. */
export function staleBuildReason(root = REPO_ROOT): string | null {
  const buildId = path.join(root, ".next", "BUILD_ID");
  if (!fs.existsSync(buildId)) return "no production build (.next) yet";
  const builtAt = fs.statSync(buildId).mtimeMs;
  const newest = Math.max(...[...SOURCE_DIRS, ...SOURCE_FILES].map((p) => newestMtime(path.join(root, p))));
  return newest > builtAt ? "the sources changed since the last build" : null;
}

/** Runs `next build` when needed; its output goes to stderr so stdout stays metrics only. */
export async function ensureBuild(log: (line: string) => void): Promise<void> {
  const reason = staleBuildReason();
  if (!reason) return;
  log(`${reason}: running next build (a few minutes)`);
  const started = Date.now();
  const child = spawn(process.execPath, [path.join(REPO_ROOT, "node_modules/next/dist/bin/next"), "build"], {
    cwd: REPO_ROOT,
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
    stdio: ["ignore", process.stderr, process.stderr],
  });
  const code = await new Promise<number | null>((resolve) => child.on("exit", resolve));
  if (code !== 0) throw new Error(`next build failed (exit ${code})`);
  log(`built in ${((Date.now() - started) / 1000).toFixed(0)} s`);
}
