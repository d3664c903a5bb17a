// Refusals tied to one form field, so the form can show the message under that field.
import { ApiError, unprocessable } from "../../app/_server/errors";

export const conflictOn = (field: string, message: string) => new ApiError(409, "conflict", message, { [field]: message });
export const unprocessableOn = (field: string, message: string) => unprocessable(message, { [field]: message });
