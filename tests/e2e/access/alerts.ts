import { ALL, CHANGERS, OWNER, type AccessTable } from "./roles";

// Holds, incidents and their export. The mail's acknowledge link is a page (app/ack), not an API route.
export const ACCESS: AccessTable = {
  "POST /api/holds": CHANGERS,
  "POST /api/holds/[id]/release": CHANGERS,
  "POST /api/incidents/[id]/acknowledge": ALL,
  "POST /api/incidents/[id]/resolve": CHANGERS,
  "POST /api/incidents/[id]/notes": ALL,
  "GET /api/incidents/export": OWNER,
};
