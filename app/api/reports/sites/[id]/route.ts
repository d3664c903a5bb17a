import { getDb } from "@/db/client";
import { OWNER_ONLY, guarded, idParam } from "@/app/_server/guard";
import { pdfResponse } from "@/app/_server/reports/response";
import { siteReportPdf } from "@/app/_server/reports/site-report";
import { periodQuery, reportPeriod } from "@/lib/reports/format";

/** A site's calibration compliance report over a period, as a PDF; owners review compliance. */
export const GET = guarded({ roles: OWNER_ONLY, action: "download compliance reports", params: idParam, query: periodQuery }, async ({ user, params, query }) => {
  const now = Date.now();
  return pdfResponse(await siteReportPdf(getDb(), user, params.id, reportPeriod(query, now), now));
});
