import { getDb } from "@/db/client";
import { ApiError } from "@/app/_server/errors";
import { CAN_CHANGE, guarded } from "@/app/_server/guard";
import { readBodyCapped } from "@/app/_server/body-limit";
import { MAX_UPLOAD_BYTES, storeUpload } from "@/app/_server/storage";

/** Room for the multipart boundaries and headers around the file itself. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;
const tooLarge = () => new ApiError(413, "too_large", "The file is larger than 5 MB; scan or photograph it at a lower resolution.");

/** Uploads a buffer certificate or photo (PDF, PNG or JPEG, at most 5 MB) as multipart field "file". */
export const POST = guarded({ roles: CAN_CHANGE, action: "attach certificates", accepts: "multipart", status: 201 }, async ({ user, req }) => {
  // Read against the cap as it streams (declared length or not), then parse the form.
  const raw = await readBodyCapped(req, MAX_UPLOAD_BYTES + MULTIPART_OVERHEAD_BYTES, tooLarge);
  let form: FormData;
  try {
    form = await new Response(raw, { headers: { "content-type": req.headers.get("content-type") ?? "" } }).formData();
  } catch {
    throw new ApiError(400, "invalid_input", "Send the file as multipart/form-data in the field \"file\".");
  }
  const file = form.get("file");
  if (!(file instanceof File)) throw new ApiError(400, "invalid_input", "Choose a file to attach.", { file: "Choose a file" });
  if (file.size > MAX_UPLOAD_BYTES) throw tooLarge();
  const row = await storeUpload(getDb(), { orgId: user.orgId, userId: user.id, filename: file.name, bytes: new Uint8Array(await file.arrayBuffer()) });
  return { upload: { id: row.id, filename: row.filename, mime: row.mime, size: row.size } };
});
