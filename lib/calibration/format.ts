/** Number formatting for the sentences in reasons and advice. */

/** Fixed decimals, without a "-0.0". */
export function fmt(value: number, decimals = 1): string {
  const s = value.toFixed(decimals);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

/**
 * Formats `value` so that it never reads as equal to `limit` when it is not:
 * 89.96 against a limit of 90 shows "89.96", not "90.0".
 */
export function fmtAgainst(value: number, limit: number, decimals = 1): string {
  for (let d = decimals; d <= decimals + 4; d++) {
    const s = fmt(value, d);
    if (value === limit || Number(s) !== limit) return s;
  }
  return String(value);
}

/** Temperatures in messages: at most two decimals, trailing zeros removed. */
export function fmtTemp(tempC: number): string {
  return `${Number(tempC.toFixed(2))} °C`;
}
