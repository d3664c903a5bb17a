import { ALL, OWNER, type AccessTable } from "./roles";

export const ACCESS: AccessTable = {
  "GET /api/reports/probes/[id]": ALL,
  "GET /api/reports/sites/[id]": OWNER,
};
