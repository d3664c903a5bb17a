"use client";
// "Offline — last updated at …": shown on every signed-in page while the device has no
// connection. The time is the last answer this page had from the server: a live update or query
// received online, or, for a page the service worker served from its cache, when it was kept.
import { useEffect, useState, useSyncExternalStore } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { CloudOff } from "lucide-react";
import { formatDateTime } from "@/lib/display/time";

function subscribe(onChange: () => void) {
  window.addEventListener("online", onChange);
  window.addEventListener("offline", onChange);
  return () => {
    window.removeEventListener("online", onChange);
    window.removeEventListener("offline", onChange);
  };
}

export function useOnline(): boolean {
  return useSyncExternalStore(
    subscribe,
    () => navigator.onLine,
    () => true,
  );
}

export function OfflineBanner() {
  const online = useOnline();
  const qc = useQueryClient();
  // Rendered from the network: the page itself is fresh as of its first render.
  const [lastFresh, setLastFresh] = useState<number | null>(() => (typeof navigator !== "undefined" && navigator.onLine ? Date.now() : null));
  const [keptAt, setKeptAt] = useState<number | null>(null);

  useEffect(() => {
    return qc.getQueryCache().subscribe((event) => {
      if (event.type === "updated" && event.action.type === "success" && navigator.onLine) setLastFresh(Date.now());
    });
  }, [qc]);

  useEffect(() => {
    if (online || !("caches" in window)) return;
    caches
      .match(window.location.href)
      .then((r) => {
        const at = Number(r?.headers.get("x-tidewell-fetched-at"));
        if (at) setKeptAt(at);
      })
      .catch(() => undefined);
  }, [online]);

  if (online) return null;
  const at = Math.max(lastFresh ?? 0, keptAt ?? 0) || null;
  return (
    <div role="status" data-testid="offline-banner" className="sticky top-14 z-10 flex items-center gap-2 border-b border-warn/40 bg-[#fff4e0] px-4 py-2 text-sm font-medium text-warn lg:top-0">
      <CloudOff className="size-4 shrink-0" aria-hidden />
      <span>
        Offline — last updated at <span className="num">{formatDateTime(at)}</span>. Values shown may be out of date.
      </span>
    </div>
  );
}
