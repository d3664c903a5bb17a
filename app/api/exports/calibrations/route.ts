import { getDb } from "@/db/client";
import { calibrationsCsv } from "@/db/queries/settings-exports";
import { siteOfOrg } from "@/db/queries/settings-sites";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { calibrationsExportSchema } from "@/lib/settings/schemas";
import { csvFilename } from "@/lib/settings/csv-filename";

/** Every calibration run (accepted and rejected, with reasons, standards and lots) as CSV. */
export const GET = guarded({ roles: OWNER_ONLY, action: "export calibration records", query: calibrationsExportSchema }, async ({ user, query }) => {
  const site = query.site ? await siteOfOrg(getDb(), user.orgId, query.site) : null;
  const csv = await calibrationsCsv(getDb(), user.orgId, query);
  return new Response(csv, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${csvFilename(`calibrations-${site?.name ?? "all-sites"}`, query.from, query.to)}"`, "cache-control": "no-store" },
  });
});
