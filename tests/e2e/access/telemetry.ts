import { ALL, type AccessTable } from "./roles";

export const ACCESS: AccessTable = {
  "GET /api/ingest/health": ALL,
};
