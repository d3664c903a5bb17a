"use client";
import { useId } from "react";
import { CircleAlert } from "lucide-react";
import { cn } from "./cn";

export interface ControlProps {
  id: string;
  "aria-invalid": boolean;
  "aria-describedby"?: string;
}

/** A labelled form control with its hint and its error (from the browser's or the server's validation). */
export function Field({
  label,
  hint,
  error,
  className,
  children,
}: {
  label: React.ReactNode;
  hint?: React.ReactNode;
  error?: string;
  className?: string;
  children: (control: ControlProps) => React.ReactNode;
}) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cn("min-w-0", className)}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium">
        {label}
      </label>
      {children({ id, "aria-invalid": Boolean(error), "aria-describedby": describedBy })}
      {error ? (
        <p id={errorId} data-field-error className="mt-1 flex items-start gap-1 text-sm text-bad">
          <CircleAlert className="mt-0.5 size-4 shrink-0" aria-hidden />
          {error}
        </p>
      ) : hint ? (
        <p id={hintId} className="mt-1 text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

/** A checkbox with its label to the right, with a large target. */
export function CheckField({ label, hint, error, children }: { label: React.ReactNode; hint?: React.ReactNode; error?: string; children: (control: ControlProps) => React.ReactNode }) {
  const id = useId();
  return (
    <div>
      <div className="flex min-h-11 items-center gap-3">
        {children({ id, "aria-invalid": Boolean(error) })}
        <label htmlFor={id} className="text-sm font-medium">
          {label}
        </label>
      </div>
      {error ? <p className="text-sm text-bad">{error}</p> : hint ? <p className="text-xs text-ink-soft">{hint}</p> : null}
    </div>
  );
}
