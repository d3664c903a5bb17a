// `npm run test:e2e`: build the web app once, then run the end-to-end suite against it.
import { spawnSync } from "node:child_process";

const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };
const steps: [string, string[]][] = [
  ["npx", ["next", "build"]],
  ["npx", ["vitest", "run", "-c", "vitest.e2e.config.ts"]],
];
for (const [cmd, args] of steps) {
  if (cmd === "npx" && args[1] === "build" && process.env.E2E_SKIP_BUILD === "1") continue;
  const r = spawnSync(cmd, args, { stdio: "inherit", env });
  if (r.status !== 0) process.exit(r.status ?? 1);
}
