// Every event of an incident in order: opened, notified whom, acknowledged by, notes, held,
// cleared, escalated, reopened, resolved. Each kind has its own icon as well as its word.
import { Bell, BellOff, CircleCheck, CircleDot, Eye, MessageSquare, PauseCircle, RotateCcw, ShieldAlert, TriangleAlert } from "lucide-react";
import type { incidentEvents } from "@/db/schema";
import { formatDateTime } from "@/lib/display/time";

type Kind = (typeof incidentEvents.$inferSelect)["kind"];

const KIND: Record<Kind, { label: string; icon: typeof Bell }> = {
  opened: { label: "Opened", icon: TriangleAlert },
  notified: { label: "Notified", icon: Bell },
  acknowledged: { label: "Acknowledged", icon: Eye },
  note: { label: "Note", icon: MessageSquare },
  held: { label: "Tank hold", icon: PauseCircle },
  cleared: { label: "Condition cleared", icon: CircleDot },
  escalated: { label: "Escalated", icon: ShieldAlert },
  resolved: { label: "Resolved", icon: CircleCheck },
  reopened: { label: "Fired again", icon: RotateCcw },
};

/** A "notified" entry that reached nobody (ingest/alerts/notify.ts nobodyToMailDetail): shown as a warning. */
const NOBODY: { label: string; icon: typeof Bell } = { label: "Nobody notified", icon: BellOff };
const reachedNobody = (e: typeof incidentEvents.$inferSelect) => e.kind === "notified" && (e.detail ?? "").startsWith("Nobody to e-mail");

export function IncidentTimeline({ events }: { events: { event: typeof incidentEvents.$inferSelect; userName: string | null }[] }) {
  return (
    <ol className="space-y-4" data-timeline>
      {events.map(({ event: e, userName }) => {
        const nobody = reachedNobody(e);
        const k = nobody ? NOBODY : KIND[e.kind];
        return (
          <li key={e.id} className="flex gap-3" data-event={e.kind} data-reached-nobody={nobody || undefined}>
            <span className={`mt-0.5 flex size-7 shrink-0 items-center justify-center rounded-full ring-1 ${nobody ? "bg-warn/10 text-warn ring-warn/40" : "bg-paper-sunk text-ink-soft ring-paper-line"}`}>
              <k.icon className="size-4" aria-hidden />
            </span>
            <div className="min-w-0">
              <p className="text-sm font-semibold">
                {k.label}
                {userName ? <span className="font-normal text-ink-soft"> · {userName}</span> : null}
              </p>
              <p className="num text-xs text-ink-faint">{formatDateTime(e.at)}</p>
              {e.detail ? <p className={`mt-1 text-sm ${nobody ? "font-medium text-warn" : "text-ink-soft"}`}>{e.detail}</p> : null}
            </div>
          </li>
        );
      })}
    </ol>
  );
}
