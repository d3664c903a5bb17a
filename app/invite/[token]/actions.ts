"use server";
// Public: the invitee has no session yet. The signed single-use token is the credential, so the
// action validates the input with the shared schema itself and answers in the guard's result shape.
import { getDb } from "@/db/client";
import { acceptInvitation } from "@/db/queries/settings-invitations";
import { ApiError, validationError } from "@/app/_server/errors";
import type { ActionResult } from "@/app/_server/guard";
import { acceptInvitationSchema, type AcceptInvitationInput } from "@/lib/settings/schemas";

export async function acceptInvitationAction(raw: AcceptInvitationInput): Promise<ActionResult<{ email: string }>> {
  try {
    const parsed = acceptInvitationSchema.safeParse(raw);
    if (!parsed.success) throw validationError(parsed.error, "form");
    return { ok: true, data: await acceptInvitation(getDb(), parsed.data.token, parsed.data.password) };
  } catch (err) {
    if (err instanceof ApiError) return { ok: false, error: { ...err.body().error, status: err.status } };
    console.error("[invite] unexpected error", err);
    return { ok: false, error: { code: "internal", message: "Something went wrong on the server; nothing was changed.", status: 500 } };
  }
}
