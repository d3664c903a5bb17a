import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { ROOT, freePort, startProcess, stopProcess, waitForHttp, type Proc } from "./stack";

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    databaseUrl: string;
    workDir: string;
  }
}

const procs: Proc[] = [];

export default async function setup(project: TestProject) {
  const workDir = fs.mkdtempSync(path.join(os.tmpdir(), "tidewell-e2e-"));
  const databaseUrl = `file:${path.join(workDir, "e2e.db")}`;
  const port = Number(process.env.E2E_PORT) || (await freePort());
  const env = { DATABASE_URL: databaseUrl, TIDEWELL_DEMO: "1", NEXT_TELEMETRY_DISABLED: "1", AUTH_SECRET: "e2e-secret-e2e-secret-e2e-secret-0000" };

  const tsx = path.join(ROOT, "node_modules/.bin/tsx");
  const seed = startProcess("seed", tsx, ["scripts/seed.ts"], env, workDir);
  await new Promise<void>((resolve, reject) => seed.child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`seed failed; see ${seed.log}`)))));
  process.env.DATABASE_URL = databaseUrl;
  const { addOtherOrganisation } = await import("./fixtures");
  await addOtherOrganisation();

  const next = path.join(ROOT, "node_modules/.bin/next");
  procs.push(startProcess("web", next, ["start", "-H", "127.0.0.1", "-p", String(port)], env, workDir));
  const baseURL = `http://127.0.0.1:${port}`;
  await waitForHttp(`${baseURL}/sign-in`, 90_000);

  project.provide("baseURL", baseURL);
  project.provide("databaseUrl", databaseUrl);
  project.provide("workDir", workDir);

  return async () => {
    for (const p of procs.reverse()) stopProcess(p);
  };
}
