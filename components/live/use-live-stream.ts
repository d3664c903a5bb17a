"use client";
// One EventSource on /api/stream with a visible connection state. The browser resumes by itself
// with Last-Event-ID; when the stream goes quiet past three heartbeats, or the browser gives up,
// a fresh EventSource is opened with ?since=<last event id>, so the server backfills the gap.
import { useEffect, useRef, useState } from "react";
import type { OrgEvent } from "@/ingest/payloads";
import type { StreamReading } from "@/server/stream/backfill";

export type LiveStatus = "connecting" | "live" | "broker-down" | "reconnecting" | "signed-out";
export type LiveEventName = "incident" | "hold" | "calibration";

export interface LiveHandlers {
  readings?: (tankId: number, readings: StreamReading[]) => void;
  event?: (name: LiveEventName, event: OrgEvent) => void;
  /** After a reconnect (events may have been missed) or a backfill too large to send in full. */
  resync?: (why: "reconnected" | "truncated") => void;
}

const QUIET_LIMIT_MS = 45_000;
const REOPEN_AFTER_MS = 3_000;

export function useLiveStream(scope: { site?: number; tank?: number }, since: number | null, handlers: LiveHandlers) {
  const [status, setStatus] = useState<LiveStatus>("connecting");
  const handlersRef = useRef(handlers);
  useEffect(() => {
    handlersRef.current = handlers;
  });
  const sinceRef = useRef(since);
  const { site, tank } = scope;

  useEffect(() => {
    let source: EventSource | null = null;
    let lastId = sinceRef.current;
    let lastMessageAt = Date.now();
    let opened = false;
    let reopenTimer: ReturnType<typeof setTimeout> | undefined;
    let stopped = false;

    const open = () => {
      const params = new URLSearchParams();
      if (site) params.set("site", String(site));
      if (tank) params.set("tank", String(tank));
      if (lastId !== null) params.set("since", String(lastId));
      const es = new EventSource(`/api/stream?${params}`);
      source = es;
      lastMessageAt = Date.now();
      const seen = (e: MessageEvent) => {
        lastMessageAt = Date.now();
        if (e.lastEventId && /^\d+$/.test(e.lastEventId)) lastId = Math.max(lastId ?? 0, Number(e.lastEventId));
      };
      es.addEventListener("ready", (e) => {
        seen(e);
        const { broker } = JSON.parse(e.data) as { broker: boolean };
        setStatus(broker ? "live" : "broker-down");
        if (opened) handlersRef.current.resync?.("reconnected");
        opened = true;
      });
      es.addEventListener("heartbeat", (e) => {
        seen(e);
        const { broker } = JSON.parse(e.data) as { broker: boolean };
        setStatus(broker ? "live" : "broker-down");
      });
      es.addEventListener("readings", (e) => {
        seen(e);
        setStatus("live"); // readings only come through a connected broker

        const { tankId, readings } = JSON.parse(e.data) as { tankId: number; readings: StreamReading[] };
        handlersRef.current.readings?.(tankId, readings);
      });
      for (const name of ["incident", "hold", "calibration"] as const) {
        es.addEventListener(name, (e) => {
          seen(e);
          handlersRef.current.event?.(name, JSON.parse(e.data) as OrgEvent);
        });
      }
      es.addEventListener("backfill", (e) => {
        seen(e);
        if ((JSON.parse(e.data) as { truncated: boolean }).truncated) handlersRef.current.resync?.("truncated");
      });
      es.onerror = () => {
        if (stopped) return;
        setStatus("reconnecting");
        // CONNECTING: the browser retries by itself. CLOSED: it gave up (an error status); find out why.
        if (es.readyState === EventSource.CLOSED) {
          es.close();
          void fetch("/api/me", { cache: "no-store" })
            .then((r) => {
              if (r.status === 401) setStatus("signed-out");
              else scheduleReopen();
            })
            .catch(scheduleReopen);
        }
      };
    };

    const scheduleReopen = () => {
      if (stopped) return;
      clearTimeout(reopenTimer);
      reopenTimer = setTimeout(() => {
        source?.close();
        open();
      }, REOPEN_AFTER_MS);
    };

    const watchdog = setInterval(() => {
      if (Date.now() - lastMessageAt > QUIET_LIMIT_MS && source?.readyState !== EventSource.CLOSED) {
        setStatus("reconnecting");
        source?.close();
        open();
      }
    }, 5_000);

    open();
    return () => {
      stopped = true;
      clearInterval(watchdog);
      clearTimeout(reopenTimer);
      source?.close();
    };
  }, [site, tank]);

  return status;
}
