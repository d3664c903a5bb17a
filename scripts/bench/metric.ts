// The bench's output format: one JSON object per line, {"metric","value","unit"}. A metric the
// bench could not measure (its section failed) is still printed, with value null.
export interface Metric {
  metric: string;
  value: number | null;
  unit: string;
}

export function printMetric(m: Metric): void {
  process.stdout.write(`${JSON.stringify({ metric: m.metric, value: m.value, unit: m.unit })}\n`);
}

export interface SectionOptions {
  seconds: number;
  /** How long the live section holds its SSE clients. */
  sseHoldSeconds: number;
  sseClients: number;
  /** The broker the ingest section publishes through. */
  brokerKind: "embedded" | "mosquitto";
  log: (line: string) => void;
}

/** A section of the bench: its own setup and teardown; yields metrics as it measures them. */
export interface BenchSection {
  name: string;
  /** Every metric the section reports, with its unit (printed as null when it fails first). */
  metrics: Record<string, string>;
  run(opts: SectionOptions): AsyncIterable<Metric>;
}
