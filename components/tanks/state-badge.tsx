import { CalendarClock, CalendarX, CircleCheck, CircleDashed, Clock, OctagonAlert, PauseCircle, TriangleAlert } from "lucide-react";
import { STATE_LABEL, type TankStateKind } from "@/lib/display/tank-state";
import { cn } from "@/components/ui/cn";

// Each state has its own word, icon shape and colour, so no state relies on colour alone.
const STYLE: Record<TankStateKind, { icon: typeof CircleCheck; cls: string }> = {
  incident: { icon: TriangleAlert, cls: "bg-bad text-white" },
  "out-of-band": { icon: OctagonAlert, cls: "bg-bad/10 text-bad ring-1 ring-bad/40" },
  stale: { icon: Clock, cls: "bg-warn/10 text-warn ring-1 ring-warn/40" },
  "calibration-lapsed": { icon: CalendarX, cls: "bg-warn/10 text-warn ring-1 ring-warn/40" },
  held: { icon: PauseCircle, cls: "bg-held/10 text-held ring-1 ring-held/40" },
  "calibration-due": { icon: CalendarClock, cls: "bg-paper-sunk text-ink-soft ring-1 ring-paper-line" },
  "no-data": { icon: CircleDashed, cls: "bg-paper-sunk text-ink-soft ring-1 ring-paper-line" },
  "in-band": { icon: CircleCheck, cls: "bg-ok/10 text-ok ring-1 ring-ok/30" },
};

export function StateBadge({ state, large = false }: { state: TankStateKind; large?: boolean }) {
  const { icon: Icon, cls } = STYLE[state];
  return (
    <span data-state={state} className={cn("inline-flex shrink-0 items-center gap-1.5 whitespace-nowrap rounded-full font-semibold", large ? "px-3 py-1 text-sm" : "px-2 py-0.5 text-xs", cls)}>
      <Icon className={large ? "size-4" : "size-3.5"} aria-hidden />
      {STATE_LABEL[state]}
    </span>
  );
}

const CAL_LABEL = { current: "Current", "due-soon": "Due soon", lapsed: "Lapsed", never: "Never calibrated", "not-needed": "—" } as const;
const CAL_CLS = { current: "text-ok", "due-soon": "text-warn", lapsed: "text-bad", never: "text-bad", "not-needed": "text-ink-faint" } as const;
const CAL_ICON = { current: CircleCheck, "due-soon": CalendarClock, lapsed: CalendarX, never: CircleDashed, "not-needed": CircleDashed } as const;

export function CalibrationBadge({ status }: { status: keyof typeof CAL_LABEL }) {
  const Icon = CAL_ICON[status];
  return (
    <span data-calibration={status} className={cn("inline-flex items-center gap-1 text-xs font-medium", CAL_CLS[status])}>
      <Icon className="size-3.5" aria-hidden />
      {CAL_LABEL[status]}
    </span>
  );
}
