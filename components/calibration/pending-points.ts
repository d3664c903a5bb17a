"use client";
// Captured calibration points are written to this device (localStorage) before they are sent, so
// a dropped connection in the greenhouse loses nothing: they are sent again when the connection
// returns, each with its own key (the server saves a key once) and how long it waited, so the
// server judges the reading the grower saw at the moment they pressed capture.
import { useCallback, useEffect, useSyncExternalStore } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { ApiRefusal, api } from "./api";

const STORE_KEY = "tidewell:pending-points";
const RETRY_MS = 4000;

export interface PendingPoint {
  runId: number;
  clientKey: string;
  /** Device time when capture was pressed. */
  pressedAt: number;
  body: Record<string, unknown>;
}

type Listener = () => void;
const listeners = new Set<Listener>();
let cache: { raw: string | null; value: PendingPoint[] } = { raw: null, value: [] };

function read(): PendingPoint[] {
  const raw = typeof window === "undefined" ? null : window.localStorage.getItem(STORE_KEY);
  if (raw !== cache.raw) {
    try {
      cache = { raw, value: raw ? (JSON.parse(raw) as PendingPoint[]) : [] };
    } catch {
      cache = { raw, value: [] };
    }
  }
  return cache.value;
}

function write(points: PendingPoint[]) {
  window.localStorage.setItem(STORE_KEY, JSON.stringify(points));
  for (const l of listeners) l();
}

function subscribe(l: Listener) {
  listeners.add(l);
  const onStorage = (e: StorageEvent) => e.key === STORE_KEY && l();
  window.addEventListener("storage", onStorage);
  return () => {
    listeners.delete(l);
    window.removeEventListener("storage", onStorage);
  };
}

function newKey(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  // Older browsers on plain http: a version-4 UUID from getRandomValues.
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6] & 0x0f) | 0x40;
  b[8] = (b[8] & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

let flushing = false;

/** The run's points waiting on this device, a way to add one, and the last refusal. */
export function usePendingPoints(runId: number, onRefused: (e: ApiRefusal) => void) {
  const qc = useQueryClient();
  const all = useSyncExternalStore(subscribe, read, () => [] as PendingPoint[]);
  const pending = all.filter((p) => p.runId === runId);

  const flush = useCallback(async () => {
    if (flushing) return;
    flushing = true;
    try {
      for (const p of read().filter((q) => q.runId === runId)) {
        try {
          await api(`/api/calibrations/runs/${p.runId}/points`, {
            method: "POST",
            json: { ...p.body, clientKey: p.clientKey, queuedMs: Math.max(0, Date.now() - p.pressedAt) },
          });
        } catch (e) {
          // No answer (offline, or the server unreachable): keep it and try again later.
          if (!(e instanceof ApiRefusal) || e.status >= 500) return;
          onRefused(e);
        }
        write(read().filter((q) => q.clientKey !== p.clientKey));
        await qc.invalidateQueries({ queryKey: ["run", p.runId] });
      }
    } finally {
      flushing = false;
    }
  }, [runId, qc, onRefused]);

  const add = useCallback(
    (body: Record<string, unknown>) => {
      write([...read(), { runId, clientKey: newKey(), pressedAt: Date.now(), body }]);
      void flush();
    },
    [runId, flush],
  );

  const waiting = pending.length > 0;
  useEffect(() => {
    if (!waiting) return;
    void flush();
    const onOnline = () => void flush();
    window.addEventListener("online", onOnline);
    const timer = window.setInterval(() => void flush(), RETRY_MS);
    return () => {
      window.removeEventListener("online", onOnline);
      window.clearInterval(timer);
    };
  }, [waiting, flush]);

  return { pending, add };
}
