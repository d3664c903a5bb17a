import path from "node:path";
import { applyMigrations } from "../db/migrate";
import { databaseUrl, getClient, getDb } from "../db/client";
import { seedIfEmpty } from "../db/seed";

await applyMigrations();
const started = Date.now();
const seeded = await seedIfEmpty(getDb(), getClient(), {
  credentialsFile: process.env.DEVICE_CREDENTIALS_FILE ?? path.join(process.cwd(), "data", "device-credentials.json"),
});
console.log(seeded ? `seeded ${databaseUrl()} in ${Date.now() - started} ms` : `already seeded: ${databaseUrl()}`);
