import { applyMigrations } from "../db/migrate";
import { databaseUrl } from "../db/client";

await applyMigrations();
console.log(`migrated ${databaseUrl()}`);
