// Addresses the custom server (server/main.ts) answers itself instead of handing them to Next.
// The role matrix (tests/e2e/role-matrix.e2e.test.ts) checks these with Next's route handlers.
export const STREAM_PATH = "/api/stream";

export const CUSTOM_SERVER_ROUTES = [{ method: "GET", template: STREAM_PATH }] as const;
