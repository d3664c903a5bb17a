"use client";
import { useActionState } from "react";
import { LogIn } from "lucide-react";
import { Button } from "@/components/ui/button";
import { signInAction, type SignInState } from "./actions";

export function SignInForm({ next, email }: { next?: string; email?: string }) {
  const [state, formAction, pending] = useActionState<SignInState, FormData>(signInAction, {});
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="next" value={next ?? "/"} />
      <label className="block">
        <span className="text-sm font-medium">E-mail</span>
        <input
          name="email"
          type="email"
          autoComplete="username"
          required
          defaultValue={state.email ?? email}
          className="mt-1 h-12 w-full rounded-md border border-paper-line bg-white px-3 text-base"
        />
      </label>
      <label className="block">
        <span className="text-sm font-medium">Password</span>
        <input
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="mt-1 h-12 w-full rounded-md border border-paper-line bg-white px-3 text-base"
        />
      </label>
      {state.error ? (
        <p role="alert" className="rounded-md border border-bad/30 bg-bad/5 px-3 py-2 text-sm text-bad">
          {state.error}
        </p>
      ) : null}
      <Button type="submit" size="lg" className="w-full" disabled={pending}>
        <LogIn className="size-4" aria-hidden /> {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
