import { ArrowRight, Circle, CircleCheck } from "lucide-react";
import { standardLabel, type RunStep } from "@/lib/calibration";
import { cn } from "@/components/ui/cn";

export function stepTitle(step: RunStep, kind: "ph" | "ec" | "temp", total: number): string {
  switch (step.key) {
    case "as-found":
      return "As-found check";
    case "clean":
      return "Clean and rinse";
    case "point":
      return kind === "ec" ? `Standard: ${standardLabel(step.standard!)}` : `Buffer ${step.index! + 1} of ${total}: ${standardLabel(step.standard!)}`;
    case "result":
      return "Result";
  }
}

/** The run's steps, each marked done / now / next by word and icon as well as colour. */
export function RunStepsList({ steps, current, kind, finished }: { steps: RunStep[]; current: number; kind: "ph" | "ec" | "temp"; finished: boolean }) {
  const total = steps.filter((s) => s.key === "point").length;
  return (
    <ol aria-label="Steps" className="space-y-1">
      {steps.map((s, i) => {
        const state = finished || s.done ? "done" : i === current ? "now" : "next";
        const Icon = state === "done" ? CircleCheck : state === "now" ? ArrowRight : Circle;
        return (
          <li
            key={`${s.key}-${s.index ?? 0}`}
            data-step={s.key}
            data-step-state={state}
            aria-current={state === "now" ? "step" : undefined}
            className={cn("flex items-start gap-2 rounded-md px-2 py-2 text-sm", state === "now" ? "bg-accent-50 font-semibold text-accent-800 ring-1 ring-accent-200" : state === "done" ? "text-ink-soft" : "text-ink-faint")}
          >
            <Icon className={cn("mt-0.5 size-4 shrink-0", state === "done" && "text-ok")} aria-hidden />
            <span className="min-w-0 flex-1">{stepTitle(s, kind, total)}</span>
            <span className="text-[11px] uppercase tracking-wide">{state === "done" ? "done" : state === "now" ? "now" : ""}</span>
          </li>
        );
      })}
    </ol>
  );
}
