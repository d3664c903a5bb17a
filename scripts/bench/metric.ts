// The bench's output format: one JSON object per line, {"metric","value","unit"}.
export interface Metric {
  metric: string;
  value: number;
  unit: string;
}

export function printMetric(m: Metric): void {
  process.stdout.write(`${JSON.stringify({ metric: m.metric, value: m.value, unit: m.unit })}\n`);
}

/** A section of the bench: its own setup and teardown; yields metrics as it measures them. */
export interface BenchSection {
  name: string;
  run(opts: { seconds: number; log: (line: string) => void }): AsyncIterable<Metric>;
}
