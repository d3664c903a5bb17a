// A safe download name: "readings-l1-butterhead-2026-11-01-to-2026-12-01.csv".
export function csvFilename(what: string, from: number, to: number): string {
  const slug = what
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "");
  const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);
  return `${slug || "export"}-${day(from)}-to-${day(to)}.csv`;
}
