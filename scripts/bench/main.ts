// npm run bench: prints one JSON object per line, {"metric","value","unit"}. Each section is a
// module of its own (scripts/bench/<section>.ts) listed in SECTIONS: ingest, live (stream,
// series and held SSE clients), alerts. Progress goes to stderr, so stdout stays
// machine-readable. A section that fails still prints its metrics (value null), the others run,
// and the exit code is 1.
//   --only NAME[,NAME]      run only these sections
//   --seconds N             measuring window per section (default 10)
//   --sse-hold-seconds N    how long the live section holds its SSE clients (default 60)
//   --sse-clients N         how many SSE clients it holds (default 1000)
//   --broker mosquitto      the ingest section publishes through Debian's Mosquitto, not the embedded broker
import { parseArgs } from "node:util";
import os from "node:os";
import { z } from "zod";
import { alertsSection } from "./alerts";
import { ingestSection } from "./ingest";
import { liveSection } from "./live";
import { printMetric, type BenchSection } from "./metric";
import { provideTestSecrets } from "../../tests/integration/helpers/secrets";

// The bench starts its own broker, ingest and web with secrets generated for this run.
provideTestSecrets();

const SECTIONS: BenchSection[] = [ingestSection, liveSection, alertsSection];

const { values } = parseArgs({
  options: { only: { type: "string" }, seconds: { type: "string" }, "sse-hold-seconds": { type: "string" }, "sse-clients": { type: "string" }, broker: { type: "string" } },
  strict: true,
});
const seconds = z.coerce.number().positive().default(10).parse(values.seconds);
const sseHoldSeconds = z.coerce.number().positive().default(60).parse(values["sse-hold-seconds"]);
const sseClients = z.coerce.number().int().positive().default(1000).parse(values["sse-clients"]);
const brokerKind = z.enum(["embedded", "mosquitto"]).default("embedded").parse(values.broker);
const only = values.only?.split(",").map((s) => s.trim());
const chosen = only ? SECTIONS.filter((s) => only.includes(s.name)) : SECTIONS;
if (chosen.length === 0) throw new Error(`no bench section named ${values.only}; have ${SECTIONS.map((s) => s.name).join(", ")}`);

let failed = false;
for (const section of chosen) {
  const log = (line: string) => process.stderr.write(`[bench:${section.name}] ${line}\n`);
  log(`starting (load average ${os.loadavg().map((l) => l.toFixed(2)).join(", ")}, ${os.cpus().length} cores)`);
  const printed = new Set<string>();
  try {
    for await (const metric of section.run({ seconds, sseHoldSeconds, sseClients, brokerKind, log })) {
      printMetric(metric);
      printed.add(metric.metric);
    }
  } catch (err) {
    failed = true;
    log(`failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  }
  for (const [metric, unit] of Object.entries(section.metrics)) if (!printed.has(metric)) printMetric({ metric, value: null, unit });
}
process.exit(failed ? 1 : 0);
