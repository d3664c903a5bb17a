import { getDb } from "@/db/client";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";
import { pdfResponse } from "@/app/_server/reports/response";
import { probeReportPdf } from "@/app/_server/reports/probe-report";
import { periodQuery, reportPeriod } from "@/lib/reports/format";

/** The probe's calibration record over a period (?from=YYYY-MM-DD&to=YYYY-MM-DD; default the last twelve months), as a PDF. */
export const GET = guarded({ roles: ALL_ROLES, params: idParam, query: periodQuery }, async ({ user, params, query }) => {
  const now = Date.now();
  return pdfResponse(await probeReportPdf(getDb(), user, params.id, reportPeriod(query, now), now));
});
