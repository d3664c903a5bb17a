// Awaiting a call that the server code is expected to refuse, to assert on the refusal.
import { ApiError } from "@/app/_server/errors";

/** Resolves with the ApiError `p` rejects with; fails the test if `p` succeeds or throws anything else. */
export async function refusal(p: Promise<unknown>): Promise<ApiError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof ApiError) return e;
    throw e;
  }
  throw new Error("expected a refusal");
}
