"use client";
import { CircleAlert } from "lucide-react";
import type { FieldErrors, FieldValues } from "react-hook-form";
import { Button } from "@/components/ui/button";

/** The message of a refusal that belongs to no single field (or repeats one that does). */
export function FormError<V extends FieldValues>({ errors }: { errors: FieldErrors<V> }) {
  const message = errors.root?.server?.message;
  if (!message) return null;
  return (
    <p role="alert" className="flex items-start gap-2 rounded-md border border-bad/30 bg-bad/5 px-3 py-2 text-sm text-bad">
      <CircleAlert className="mt-0.5 size-4 shrink-0" aria-hidden />
      {message}
    </p>
  );
}

export function SubmitButton({ pending, children, pendingLabel = "Saving…" }: { pending: boolean; children: React.ReactNode; pendingLabel?: string }) {
  return (
    <Button type="submit" disabled={pending} size="lg" className="sm:h-10 sm:text-sm">
      {pending ? pendingLabel : children}
    </Button>
  );
}

/** Turns "" from an empty select or number input into null, anything else into a number. */
export const nullableNumber = (v: unknown) => (v === "" || v === null || v === undefined ? null : Number(v));
