// npm run bench: prints one JSON object per line, {"metric","value","unit"}. Each section is a
// module of its own (scripts/bench/<section>.ts) listed in SECTIONS: ingest, live (stream and
// series), alerts. Progress goes to stderr, so stdout stays machine-readable.
//   --only NAME[,NAME]   run only these sections
//   --seconds N          measuring window per section (default 10)
import { parseArgs } from "node:util";
import { z } from "zod";
import { alertsSection } from "./alerts";
import { ingestSection } from "./ingest";
import { liveSection } from "./live";
import { printMetric, type BenchSection } from "./metric";
import { provideTestSecrets } from "../../tests/integration/helpers/secrets";

// The bench starts its own broker, ingest and web with secrets generated for this run.
provideTestSecrets();

const SECTIONS: BenchSection[] = [ingestSection, liveSection, alertsSection];

const { values } = parseArgs({ options: { only: { type: "string" }, seconds: { type: "string" } }, strict: true });
const seconds = z.coerce.number().positive().default(10).parse(values.seconds);
const only = values.only?.split(",").map((s) => s.trim());
const chosen = only ? SECTIONS.filter((s) => only.includes(s.name)) : SECTIONS;
if (chosen.length === 0) throw new Error(`no bench section named ${values.only}; have ${SECTIONS.map((s) => s.name).join(", ")}`);

for (const section of chosen) {
  const log = (line: string) => process.stderr.write(`[bench:${section.name}] ${line}\n`);
  for await (const metric of section.run({ seconds, log })) printMetric(metric);
}
process.exit(0);
