import { getDb } from "@/db/client";
import { readingsCsv } from "@/db/queries/settings-exports";
import { OWNER_ONLY, guarded } from "@/app/_server/guard";
import { readingsExportSchema } from "@/lib/settings/schemas";
import { csvFilename } from "@/lib/settings/csv-filename";

/** A tank's readings (raw and corrected, with quality flags) as CSV, streamed. */
export const GET = guarded({ roles: OWNER_ONLY, action: "export readings", query: readingsExportSchema }, async ({ user, query }) => {
  const { tank, stream } = await readingsCsv(getDb(), user.orgId, query);
  return new Response(stream, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${csvFilename(`readings-${tank.name}`, query.from, query.to)}"`, "cache-control": "no-store" },
  });
});
