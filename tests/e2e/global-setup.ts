import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { generateSecrets, type SecretName } from "../../ingest/secrets";
import { ROOT, freePort, startProcess, stopProcess, waitFor, waitForHttp, type Proc } from "./stack";

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    databaseUrl: string;
    workDir: string;
    mqttUrl: string;
    mailSinkURL: string;
    secrets: Record<SecretName, string>;
  }
}

const procs: Proc[] = [];

export default async function setup(project: TestProject) {
  const workDir = fs.mkdtempSync(path.join(os.tmpdir(), "tidewell-e2e-"));
  const databaseUrl = `file:${path.join(workDir, "e2e.db")}`;
  const port = Number(process.env.E2E_PORT) || (await freePort());
  // Broker, ingest, simulator and web all meet on one embedded broker on a free port.
  const brokerPort = await freePort();
  const mqttUrl = `mqtt://127.0.0.1:${brokerPort}`;
  const credentialsFile = path.join(workDir, "device-credentials.json");
  // The mail sink (scripts/mail-sink.ts): SMTP for the app's outgoing mail, HTTP for tests to read it.
  const [smtpPort, mailHttpPort] = [await freePort(), await freePort()];
  const mailSinkURL = `http://127.0.0.1:${mailHttpPort}`;
  // This run's own secrets, handed to every process of the stack and to the test files.
  const secrets = generateSecrets();
  Object.assign(process.env, secrets);
  const env = {
    ...secrets,
    DATABASE_URL: databaseUrl,
    TIDEWELL_DEMO: "1",
    NEXT_TELEMETRY_DISABLED: "1",
    BROKER_PORT: String(brokerPort),
    BROKER_STATE_FILE: path.join(workDir, "broker-state.json"),
    MQTT_URL: mqttUrl,
    DEVICE_CREDENTIALS_FILE: credentialsFile,
    SIM_CREDENTIALS_FILE: credentialsFile,
    MAIL_SINK_SMTP_PORT: String(smtpPort),
    MAIL_SINK_HTTP_PORT: String(mailHttpPort),
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    MAIL_SINK_URL: mailSinkURL,
    APP_URL: `http://127.0.0.1:${port}`,
    // The alert runner ticks every second and resolves after 5 s clear, so tests need not wait minutes.
    ALERTS_TICK_MS: "1000",
    ALERTS_RESOLVE_AFTER_MS: "5000",
    CALIBRATION_STABILITY_WINDOW_MS: "6000",
  };

  const stopAll = () => {
    for (const p of procs.reverse()) stopProcess(p);
  };
  try {
    await startStack();
  } catch (err) {
    stopAll(); // a failed start must not leave the stack running
    for (const p of procs) console.error(`--- ${p.name} (last lines of ${p.log})\n${fs.readFileSync(p.log, "utf8").split("\n").slice(-30).join("\n")}`);
    throw err;
  }

  project.provide("baseURL", `http://127.0.0.1:${port}`);
  project.provide("databaseUrl", databaseUrl);
  project.provide("workDir", workDir);
  project.provide("mqttUrl", mqttUrl);
  project.provide("mailSinkURL", mailSinkURL);
  project.provide("secrets", secrets);

  return async () => {
    stopAll();
    // The broker writes its state file as it stops: wait for every process before removing the folder.
    await Promise.all(procs.map((p) => exited(p, 15_000)));
    if (process.env.E2E_KEEP_DIR) return;
    try {
      fs.rmSync(workDir, { recursive: true, force: true, maxRetries: 5, retryDelay: 200 });
    } catch (err) {
      console.warn(`could not remove ${workDir}: ${String(err)}`);
    }
  };

  async function exited(p: Proc, timeoutMs: number): Promise<void> {
    if (p.child.exitCode !== null || p.child.signalCode !== null) return;
    await new Promise<void>((resolve) => {
      const timer = setTimeout(() => {
        stopProcess(p, "SIGKILL");
        resolve();
      }, timeoutMs);
      p.child.once("exit", () => {
        clearTimeout(timer);
        resolve();
      });
    });
  }

  async function startStack() {
    const tsx = path.join(ROOT, "node_modules/.bin/tsx");
    const seed = startProcess("seed", tsx, ["scripts/seed.ts"], env, workDir);
    await new Promise<void>((resolve, reject) => seed.child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`seed failed; see ${seed.log}`)))));
    process.env.DATABASE_URL = databaseUrl;
    const { addOtherOrganisation } = await import("./fixtures");
    await addOtherOrganisation();

    procs.push(startProcess("mail-sink", tsx, ["scripts/mail-sink.ts"], env, workDir));
    await waitForHttp(`${mailSinkURL}/messages`, 30_000);

    const broker = startProcess("broker", tsx, ["ingest/broker-main.ts"], env, workDir);
    procs.push(broker);
    await waitFor("the broker", async () => fs.readFileSync(broker.log, "utf8").includes("listening on"), 30_000);
    const ingest = startProcess("ingest", tsx, ["ingest/main.ts"], env, workDir);
    procs.push(ingest);
    await waitFor("the ingest", async () => fs.readFileSync(ingest.log, "utf8").includes("subscribed"), 30_000);

    // The web as `npm start` runs it: the custom server (server/main.ts) in front of Next.
    procs.push(startProcess("web", tsx, ["server/main.ts", "-H", "127.0.0.1", "-p", String(port)], env, workDir));
    const baseURL = `http://127.0.0.1:${port}`;
    await waitForHttp(`${baseURL}/sign-in`, 90_000);
    const simulator = startProcess("simulator", tsx, ["scripts/simulator/main.ts"], env, workDir);
    procs.push(simulator);
    // Tests send faults and place holds at once: the simulator must be listening by then.
    await waitFor("the simulator", async () => fs.readFileSync(simulator.log, "utf8").includes("ready: listening"), 30_000);
  }
}
