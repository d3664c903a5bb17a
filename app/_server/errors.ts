// The one error shape of Tidewell's API: { error: { code, message, fields? } }.
import { z } from "zod";

export type ErrorStatus = 400 | 401 | 403 | 404 | 405 | 406 | 409 | 413 | 415 | 422 | 429 | 500;

export interface ApiErrorBody {
  error: { code: string; message: string; fields?: Record<string, string> };
}

export class ApiError extends Error {
  constructor(
    public status: ErrorStatus,
    public code: string,
    message: string,
    public fields?: Record<string, string>,
  ) {
    super(message);
  }
  body(): ApiErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}

/** The status and body an API answers for a thrown error (anything not an ApiError is a 500, logged). */
export function errorAnswer(err: unknown): { status: number; body: ApiErrorBody } {
  if (err instanceof ApiError) return { status: err.status, body: err.body() };
  console.error("[api] unexpected error", err);
  return { status: 500, body: { error: { code: "internal", message: "Something went wrong on the server; nothing was changed." } } };
}

export const unauthorized = () => new ApiError(401, "unauthorized", "Sign in to continue.");
export const forbidden = (what = "do this") => new ApiError(403, "forbidden", `Your role cannot ${what}.`);
export const notFound = (what = "That record") => new ApiError(404, "not_found", `${what} was not found.`);
export const conflict = (message: string) => new ApiError(409, "conflict", message);
export const unprocessable = (message: string, fields?: Record<string, string>) => new ApiError(422, "unprocessable", message, fields);

/** Turns a zod failure into field messages keyed by dotted path. */
export function fieldsFromZod(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join(".") || "_";
    fields[key] ??= issue.message;
  }
  return fields;
}

export function validationError(error: z.ZodError, where = "request"): ApiError {
  const fields = fieldsFromZod(error);
  const first = Object.entries(fields)[0];
  const hint = first ? (first[0] === "_" ? first[1] : `${first[0]}: ${first[1]}`) : "invalid input";
  return new ApiError(400, "invalid_input", `The ${where} is not valid (${hint}).`, fields);
}
