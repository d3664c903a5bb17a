import { ALL, OWNER, type AccessTable } from "./roles";

export const ACCESS: AccessTable = {
  "GET /api/auth/[...nextauth]": "public",
  "POST /api/auth/[...nextauth]": "public",
  "GET /api/me": ALL,
  "GET /api/tanks": ALL,
  "GET /api/tanks/[id]": ALL,
  "GET /api/users": OWNER,
  "POST /api/incidents/[id]/acknowledge": ALL,
};
