import { CircleCheck, Eye, TriangleAlert } from "lucide-react";
import type { IncidentState } from "@/db/schema";
import { cn } from "@/components/ui/cn";

const STYLE = {
  open: { icon: TriangleAlert, cls: "bg-bad text-white", label: "Open" },
  acknowledged: { icon: Eye, cls: "bg-warn/10 text-warn ring-1 ring-warn/40", label: "Acknowledged" },
  resolved: { icon: CircleCheck, cls: "bg-paper-sunk text-ink-soft ring-1 ring-paper-line", label: "Resolved" },
} as const;

export function IncidentStateBadge({ state }: { state: IncidentState }) {
  const s = STYLE[state];
  return (
    <span data-incident-state={state} className={cn("inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-semibold", s.cls)}>
      <s.icon className="size-3.5" aria-hidden />
      {s.label}
    </span>
  );
}
