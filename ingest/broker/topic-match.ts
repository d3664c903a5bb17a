// MQTT topic and filter matching (MQTT 3.1.1 section 4.7), pure functions for the ACL.

/** True when a topic name (no wildcards) matches a topic filter. */
export function topicMatches(filter: string, topic: string): boolean {
  const f = filter.split("/");
  const t = topic.split("/");
  // Filters starting with a wildcard never match topics starting with "$" [MQTT-4.7.2-1].
  if (topic.startsWith("$") && (f[0] === "+" || f[0] === "#")) return false;
  for (let i = 0; i < f.length; i++) {
    if (f[i] === "#") return true;
    if (i >= t.length) return false;
    if (f[i] !== "+" && f[i] !== t[i]) return false;
  }
  return f.length === t.length;
}

/** True when the filter is well formed: `#` only last and alone in its level, `+` alone in its level. */
export function isValidFilter(filter: string): boolean {
  if (filter.length === 0) return false;
  const levels = filter.split("/");
  return levels.every((level, i) => {
    if (level.includes("#")) return level === "#" && i === levels.length - 1;
    if (level.includes("+")) return level === "+";
    return true;
  });
}

/**
 * True when every topic the `requested` filter can match is also matched by `allowed`, so a
 * subscription to `requested` cannot receive anything `allowed` does not permit.
 */
export function filterWithin(requested: string, allowed: string): boolean {
  if (!isValidFilter(requested)) return false;
  const r = requested.split("/");
  const a = allowed.split("/");
  for (let i = 0; i < r.length; i++) {
    if (i >= a.length) return false;
    if (a[i] === "#") return true;
    if (r[i] === "#") return false; // requested reaches deeper or wider than allowed
    if (a[i] === "+") continue; // a literal or "+" within one level
    if (r[i] !== a[i]) return false; // "+" requested where allowed is literal, or another literal
  }
  return r.length === a.length;
}
