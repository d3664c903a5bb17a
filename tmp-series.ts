import { drizzle } from "drizzle-orm/libsql";
import * as schema from "./db/schema";
import { loadTankSeries } from "./app/api/tanks/[id]/series/load-series";
import { createSeededDatabase } from "./tests/integration/helpers/database";
import { openDb } from "./tests/integration/helpers/tidewell";
import { addYearOfHistory } from "./scripts/bench/live";
const db = await createSeededDatabase({ label: "tmp-series" });
const client = openDb(db);
const tank = await addYearOfHistory(client, Date.now());
const orm = drizzle(client, { schema });
const org = 1;
for (const days of [30, 365]) {
  const ms: number[] = [];
  for (let i = 0; i < 30; i++) {
    const t0 = performance.now();
    await loadTankSeries(orm, org, tank, Date.now() - days * 86400000, Date.now(), 2000);
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  console.log(days, "median", ms[15].toFixed(1), "p95", ms[28].toFixed(1));
}
client.close(); db.remove();
