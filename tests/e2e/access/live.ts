import { ALL, type AccessTable } from "./roles";

// The live stream answers 406 to a plain request (no Accept: text/event-stream), so the matrix can read it to the end.
export const ACCESS: AccessTable = {
  "GET /api/stream": ALL,
  "GET /api/tanks/[id]/series": ALL,
};
