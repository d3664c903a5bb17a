"use client";
import { CircleAlert, LogIn, Radio, RefreshCw, ServerCrash } from "lucide-react";
import { cn } from "@/components/ui/cn";
import type { LiveStatus } from "./use-live-stream";

const LOOK: Record<LiveStatus, { label: string; icon: typeof Radio; cls: string }> = {
  live: { label: "Live", icon: Radio, cls: "bg-ok/10 text-ok ring-ok/30" },
  connecting: { label: "Connecting…", icon: RefreshCw, cls: "bg-paper-sunk text-ink-soft ring-paper-line" },
  reconnecting: { label: "Reconnecting…", icon: RefreshCw, cls: "bg-warn/10 text-warn ring-warn/40" },
  "broker-down": { label: "No live feed", icon: ServerCrash, cls: "bg-warn/10 text-warn ring-warn/40" },
  "signed-out": { label: "Signed out", icon: LogIn, cls: "bg-bad/10 text-bad ring-bad/40" },
};

/** The stream's state in words and shape: a night manager must know whether the wall is current. */
export function LiveStatusBadge({ status, large = false }: { status: LiveStatus; large?: boolean }) {
  const look = LOOK[status] ?? { label: status, icon: CircleAlert, cls: "" };
  const Icon = look.icon;
  return (
    <span
      role="status"
      aria-live="polite"
      data-live-status={status}
      className={cn("inline-flex items-center gap-1.5 rounded-full font-semibold ring-1", large ? "px-3 py-1.5 text-base" : "px-2.5 py-1 text-sm", look.cls)}
    >
      <Icon className={cn(large ? "size-5" : "size-4", status === "live" && "animate-pulse", (status === "connecting" || status === "reconnecting") && "animate-spin")} aria-hidden />
      {look.label}
      {status === "signed-out" ? (
        <a href="/sign-in" className="ml-1 underline">
          Sign in
        </a>
      ) : null}
    </span>
  );
}
