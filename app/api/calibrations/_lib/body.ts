// Body parsing for routes that first check the record is in the user's organisation, so a
// record of another farm answers 404 whatever the body says.
import type { z } from "zod";
import { ApiError, validationError } from "@/app/_server/errors";

export async function parseBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  const text = await req.text();
  let raw: unknown = {};
  if (text) {
    try {
      raw = JSON.parse(text);
    } catch {
      throw new ApiError(400, "invalid_json", "The request body is not valid JSON.");
    }
  }
  const result = schema.safeParse(raw);
  if (!result.success) throw validationError(result.error, "request body");
  return result.data;
}
