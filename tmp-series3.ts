import Database from "libsql";
import { createSeededDatabase } from "./tests/integration/helpers/database";
import { openDb } from "./tests/integration/helpers/tidewell";
import { addYearOfHistory } from "./scripts/bench/live";
const db = await createSeededDatabase({ label: "tmp-series" });
const client = openDb(db);
const tank = await addYearOfHistory(client, Date.now());
const pid = Number((await client.execute({ sql: "SELECT id FROM probes WHERE tank_id = ?", args: [tank] })).rows[0].id);
client.close();
const n = new Database(db.file);
if (process.argv[2]) n.exec(process.argv[2]);
const now = Date.now();
const start = Math.floor((now - 365 * 86400000) / 21600000) * 21600000;
for (const [name, sql] of [
  ["count", `SELECT count(*) FROM rollups_hourly WHERE probe_id = ${pid}`],
  ["group", `SELECT (hour - ${start}) / 21600000 AS b, min(min), max(max), sum(sum), sum(count) FROM rollups_hourly WHERE probe_id = ${pid} AND hour >= ${start} GROUP BY b`],
  ["plain", `SELECT hour, min, max, sum, count FROM rollups_hourly WHERE probe_id = ${pid} AND hour >= ${start}`],
]) {
  const st = n.prepare(sql);
  const t0 = performance.now();
  let rows = 0;
  for (let i = 0; i < 10; i++) rows = st.all().length;
  console.log(name, ((performance.now() - t0) / 10).toFixed(2), "ms", rows);
}
db.remove();
