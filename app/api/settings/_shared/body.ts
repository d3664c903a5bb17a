// For routes on one record: the record is looked up in the caller's organisation first (404), and
// only then is the body validated (400), so another farm's ids reveal nothing about their records.
import type { z } from "zod";
import { ApiError, validationError } from "@/app/_server/errors";

export async function bodyOf<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  const text = await req.text();
  let raw: unknown = {};
  if (text) {
    try {
      raw = JSON.parse(text);
    } catch {
      throw new ApiError(400, "invalid_json", "The request body is not valid JSON.");
    }
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw validationError(parsed.error, "request body");
  return parsed.data;
}
