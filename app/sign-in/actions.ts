"use server";
import { AuthError } from "next-auth";
import { z } from "zod";
import { signIn } from "@/app/_server/auth";

export interface SignInState {
  error?: string;
  email?: string;
}

const MESSAGES: Record<string, string> = {
  "wrong-credentials": "That e-mail and password do not match an account. Check both and try again.",
  locked: "Too many failed sign-ins for this account. Wait a few minutes, then try again.",
  deactivated: "This account has been deactivated. Ask your farm's owner to restore it.",
  "invalid-input": "Enter your e-mail address and password.",
};

const form = z.object({ email: z.string().trim(), password: z.string(), next: z.string().optional() });

export async function signInAction(_prev: SignInState, data: FormData): Promise<SignInState> {
  const { email, password, next } = form.parse(Object.fromEntries(data));
  // Only same-site paths are followed after sign-in.
  const redirectTo = next && next.startsWith("/") && !next.startsWith("//") ? next : "/";
  try {
    await signIn("credentials", { email, password, redirectTo });
    return {};
  } catch (err) {
    if (err instanceof AuthError) {
      const code = (err as AuthError & { code?: string }).code ?? "wrong-credentials";
      return { email, error: MESSAGES[code] ?? MESSAGES["wrong-credentials"] };
    }
    throw err; // the redirect after a successful sign-in
  }
}
