"use client";
// One click from the tank wall or the tank page: place a hold (with a reason and a length) or
// release it; shows the time left. Growers and owners only; the server checks the role again.
import { useEffect, useState } from "react";
import { useRouter } from "next/navigation";
import { useQueryClient } from "@tanstack/react-query";
import { PauseCircle, PlayCircle } from "lucide-react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { formatDuration } from "@/lib/display/time";
import { ApiCallError, postJson } from "@/components/incidents/api";
import { useMyRole } from "@/components/incidents/use-me";
import { HoldDialog, type HoldForm } from "./hold-dialog";

interface ActiveHold {
  id: number;
  reason: string;
  placedAt: number;
  plannedEndAt: number;
}

interface HoldResult {
  dosing: { status: "sent" | "no-controller" | "failed"; message: string };
}

/** The time, ticking; null until mounted, so the server render and hydration agree. */
function useClock(everyMs: number) {
  const [now, setNow] = useState<number | null>(null);
  useEffect(() => {
    const first = setTimeout(() => setNow(Date.now()), 0);
    const id = setInterval(() => setNow(Date.now()), everyMs);
    return () => {
      clearTimeout(first);
      clearInterval(id);
    };
  }, [everyMs]);
  return now;
}

function reportDosing(done: string, r: HoldResult) {
  if (r.dosing.status === "failed") toast.error(r.dosing.message, { duration: 20_000 });
  else toast.success(`${done} ${r.dosing.status === "sent" ? r.dosing.message : ""}`.trim());
}

export function HoldControl({ tankId, tankName, hold, size = "sm" }: { tankId: number; tankName: string; hold: ActiveHold | null; size?: "sm" | "lg" }) {
  const role = useMyRole();
  const router = useRouter();
  const client = useQueryClient();
  const now = useClock(15_000);
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [serverError, setServerError] = useState<{ message: string; fields?: Record<string, string> } | null>(null);
  const canHold = role === "owner" || role === "grower";

  const refresh = () => {
    void client.invalidateQueries({ queryKey: ["tanks"] });
    router.refresh();
  };

  async function place(v: HoldForm) {
    setServerError(null);
    try {
      const r = await postJson<HoldResult>("/api/holds", { tankId, reason: v.reason, minutes: v.minutes });
      setOpen(false);
      reportDosing(`${tankName} is on hold.`, r);
      refresh();
    } catch (err) {
      setServerError(err instanceof ApiCallError ? { message: err.message, fields: err.fields } : { message: String(err) });
    }
  }

  async function release() {
    if (!hold) return;
    setBusy(true);
    try {
      const r = await postJson<HoldResult>(`/api/holds/${hold.id}/release`);
      reportDosing(`Hold on ${tankName} released; alerts return after settling.`, r);
      refresh();
    } catch (err) {
      toast.error((err as Error).message);
    } finally {
      setBusy(false);
    }
  }

  const left = hold && now !== null ? hold.plannedEndAt - now : null;
  return (
    <span className="inline-flex flex-wrap items-center gap-2" data-hold-control={hold ? "held" : "live"}>
      {hold ? (
        <span className={cn("inline-flex items-center gap-1 font-medium", left !== null && left < 0 ? "text-bad" : "text-held")} data-hold-left>
          <PauseCircle className="size-4" aria-hidden />
          {left === null ? "On hold" : left >= 0 ? `On hold · ${formatDuration(left)} left` : `On hold · ${formatDuration(-left)} past its planned end`}
        </span>
      ) : null}
      {canHold ? (
        hold ? (
          <Button type="button" size={size} variant="secondary" disabled={busy} onClick={release}>
            <PlayCircle className="size-4" aria-hidden /> {busy ? "Releasing…" : "Release hold"}
          </Button>
        ) : (
          <Button type="button" size={size} variant="secondary" onClick={() => setOpen(true)}>
            <PauseCircle className="size-4" aria-hidden /> Hold
          </Button>
        )
      ) : null}
      {canHold && !hold && open ? (
        <HoldDialog
          tankName={tankName}
          onClose={() => {
            setOpen(false);
            setServerError(null);
          }}
          onSubmit={place}
          serverError={serverError}
        />
      ) : null}
    </span>
  );
}
