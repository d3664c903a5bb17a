/** One day in milliseconds. */
export const DAY_MS = 86_400_000;
