import { ALL, CHANGERS, OWNER, type AccessTable } from "./roles";

export const ACCESS: AccessTable = {
  "GET /api/calibrations/runs": ALL,
  "POST /api/calibrations/runs": CHANGERS,
  "GET /api/calibrations/runs/[id]": ALL,
  "POST /api/calibrations/runs/[id]/points": CHANGERS,
  "POST /api/calibrations/runs/[id]/steps": CHANGERS,
  "POST /api/calibrations/runs/[id]/complete": CHANGERS,
  "POST /api/calibrations/runs/[id]/abandon": CHANGERS,
  "POST /api/calibrations/runs/[id]/simulate": CHANGERS,
  "GET /api/calibrations/runs/[id]/certificate": ALL,
  "POST /api/calibrations/manual": CHANGERS,
  "GET /api/calibrations/compliance": OWNER,
  "POST /api/uploads": CHANGERS,
  "GET /api/probes/[id]": ALL,
  "GET /api/probes/[id]/live": ALL,
  "GET /api/probes/[id]/spot-checks": ALL,
  "POST /api/probes/[id]/spot-checks": CHANGERS,
  "POST /api/spot-checks/import": CHANGERS,
  "PUT /api/spot-checks/[id]": CHANGERS,
  "DELETE /api/spot-checks/[id]": CHANGERS,
};
