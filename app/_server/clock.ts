/** The time a server render is computed for (server components render once per request). */
export function requestNow(): number {
  return Date.now();
}
