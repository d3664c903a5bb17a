// A one-line, human reading of an audit entry's detail: `phMax 6.5 → 6.4 · tank L1`.
export function describeAuditDetail(detail: Record<string, unknown> | null): string {
  if (!detail) return "";
  const parts: string[] = [];
  for (const [key, value] of Object.entries(detail)) {
    if (key === "changed" && value && typeof value === "object") {
      for (const [field, pair] of Object.entries(value as Record<string, unknown>)) {
        parts.push(Array.isArray(pair) && pair.length === 2 ? `${field} ${show(pair[0])} → ${show(pair[1])}` : `${field} ${show(pair)}`);
      }
    } else {
      parts.push(`${key} ${show(value)}`);
    }
  }
  return parts.join(" · ");
}

function show(v: unknown): string {
  if (v === null || v === undefined) return "—";
  if (Array.isArray(v)) return v.map(show).join(", ");
  if (typeof v === "object") return JSON.stringify(v);
  return String(v);
}
