import { getDb } from "@/db/client";
import { runInOrg } from "@/db/queries/calibration-scope";
import { notFound } from "@/app/_server/errors";
import { ALL_ROLES, guarded, idParam } from "@/app/_server/guard";
import { readUpload } from "@/app/_server/storage";

/** The buffer certificate or photo attached to a run, for this organisation only, as a download. */
export const GET = guarded({ roles: ALL_ROLES, params: idParam }, async ({ user, params }) => {
  const db = getDb();
  const { run } = await runInOrg(db, user.orgId, params.id);
  const file = run.uploadId ? await readUpload(db, user.orgId, run.uploadId) : null;
  if (!file) throw notFound("A certificate for this run");
  return new Response(new Uint8Array(file.bytes), {
    headers: {
      "content-type": file.row.mime,
      "content-length": String(file.row.size),
      // Always a download, never rendered in our origin, whatever a browser would make of it.
      "content-disposition": `attachment; filename="${file.row.filename}"`,
      "x-content-type-options": "nosniff",
      "content-security-policy": "sandbox; default-src 'none'",
      "cache-control": "private, no-store",
    },
  });
});
