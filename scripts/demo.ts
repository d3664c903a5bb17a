// `npm run demo`: build, migrate, seed if empty, then run every process of the demo under one
// supervisor on loopback. Ctrl-C stops them all.
import fs from "node:fs";
import path from "node:path";
import { spawnSync } from "node:child_process";
import concurrently from "concurrently";
import { applyMigrations } from "../db/migrate";
import { databaseUrl, getClient, getDb } from "../db/client";
import { seedIfEmpty } from "../db/seed";
import { DEMO_PASSWORD, DEMO_USERS } from "../db/seed/scenario";
import { SECRET_NAMES } from "../ingest/secrets";
import { loadOrCreateDemoSecrets } from "./demo-secrets";

const PORT = Number(process.env.PORT ?? 3000);
const secretsFile = path.join(process.cwd(), "data", "secrets.json");
const { secrets, created } = loadOrCreateDemoSecrets(secretsFile);
if (created) console.log(`[demo] generated this installation's secrets into ${secretsFile} (mode 0600)`);
const env = {
  // Secrets from the environment win over the generated ones.
  ...Object.fromEntries(SECRET_NAMES.map((n) => [n, process.env[n] || secrets[n]])),
  TIDEWELL_DEMO: "1",
  NEXT_TELEMETRY_DISABLED: "1",
  DATABASE_URL: databaseUrl(),
  SMTP_URL: process.env.SMTP_URL ?? "smtp://127.0.0.1:2525",
  MAIL_SINK_URL: process.env.MAIL_SINK_URL ?? "http://127.0.0.1:2526",
  APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${PORT}`,
};
Object.assign(process.env, env);

if (process.env.DEMO_SKIP_BUILD !== "1" || !fs.existsSync(".next/BUILD_ID")) {
  console.log("[demo] building the web app (about a minute)…");
  const build = spawnSync("npx", ["next", "build"], { stdio: "inherit", env: { ...process.env, ...env } });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

// Seed after the build, so the seeded history ends moments before the simulator takes over.
await applyMigrations();
const credentialsFile = path.join(process.cwd(), "data", "device-credentials.json");
if (await seedIfEmpty(getDb(), getClient(), { credentialsFile })) console.log("[demo] seeded the demo farm");
getClient().close();

const commands = [
  { name: "mail", command: "tsx scripts/mail-sink.ts", prefixColor: "magenta" },
  { name: "broker", command: "tsx ingest/broker-main.ts", prefixColor: "blue" },
  { name: "ingest", command: "tsx ingest/main.ts", prefixColor: "cyan" },
  { name: "sim", command: "tsx scripts/simulator/main.ts", prefixColor: "yellow" },
  { name: "web", command: `tsx server/main.ts -H 127.0.0.1 -p ${PORT}`, prefixColor: "green" },
];

const { result } = concurrently(
  commands.map(({ name, command, prefixColor }) => ({ name, command, prefixColor, env })),
  { killOthersOn: ["failure"], prefix: "name", restartTries: 0 },
);

setTimeout(() => {
  console.log(`\n  Tidewell demo is running at ${env.APP_URL}\n`);
  console.log(`  Sign in with any of these (password: ${DEMO_PASSWORD}):`);
  for (const u of DEMO_USERS) console.log(`    ${u.role.padEnd(14)} ${u.email}`);
  console.log(`\n  Demo mailbox (owner): ${env.APP_URL}/mailbox · Ctrl-C stops everything.\n`);
}, 4000);

result.then(
  () => process.exit(0),
  () => process.exit(0),
);
