"use client";
import { useCallback, useState } from "react";
import { CloudOff } from "lucide-react";
import { format } from "date-fns";
import { Button } from "@/components/ui/button";
import { ApiRefusal } from "./api";
import { usePendingPoints } from "./pending-points";
import { useOnline } from "@/components/pwa/offline-banner";
import type { LiveJson } from "./types";

const input = "h-12 w-full rounded-md border border-paper-line bg-paper-raised px-3 text-base";

/** Lot, expiry, temperature and (for an unsettled reading) a note; captures the live reading. */
export function CaptureForm({
  runId,
  purpose,
  live,
  defaults,
  lotRequired,
}: {
  runId: number;
  purpose: "as_found" | "point";
  live: LiveJson | undefined;
  defaults: { lot?: string; expiresOn?: string };
  lotRequired: boolean;
}) {
  const [lot, setLot] = useState(defaults.lot ?? "");
  const [expiresOn, setExpiresOn] = useState(defaults.expiresOn ?? "");
  const [typeTemp, setTypeTemp] = useState(false);
  const [tempC, setTempC] = useState("");
  const [early, setEarly] = useState(false);
  const [note, setNote] = useState("");
  const [error, setError] = useState<ApiRefusal | null>(null);
  const stable = Boolean(live?.stability.stable);
  const noTemp = !live?.temperature;

  const onRefused = useCallback((e: ApiRefusal) => setError(e), []);
  const { pending, add } = usePendingPoints(runId, onRefused);
  const capture = () => {
    setError(null);
    add({
      purpose,
      lot: lot.trim() || undefined,
      expiresOn: expiresOn || undefined,
      tempC: typeTemp || noTemp ? (tempC === "" ? undefined : Number(tempC)) : undefined,
      note: early ? note : undefined,
      // The reading on screen: the server judges its stability, not that of a later sample.
      readingTs: live?.latest?.ts,
    });
  };
  const waiting = pending[0];
  const online = useOnline();

  const canCapture = (stable || (early && note.trim().length > 0)) && (!lotRequired || (lot.trim() && expiresOn));
  return (
    <form
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        capture();
      }}
    >
      <div className="grid gap-3 sm:grid-cols-2">
        <label className="block text-sm font-medium">
          Bottle lot{lotRequired ? "" : " (optional)"}
          <input className={input} name="lot" value={lot} onChange={(e) => setLot(e.target.value)} autoComplete="off" />
          {error?.fields.lot ? <span className="text-xs text-bad">{error.fields.lot}</span> : null}
        </label>
        <label className="block text-sm font-medium">
          Expiry date{lotRequired ? "" : " (optional)"}
          <input className={input} type="date" name="expiresOn" value={expiresOn} onChange={(e) => setExpiresOn(e.target.value)} />
          {error?.fields.expiresOn ? <span className="text-xs font-semibold text-bad">{error.fields.expiresOn}</span> : null}
        </label>
      </div>
      <div className="space-y-2">
        {noTemp ? (
          <p className="text-sm text-warn">The tank&apos;s temperature probe has no recent reading: type the buffer&apos;s temperature.</p>
        ) : (
          <label className="flex min-h-10 items-center gap-2 text-sm">
            <input type="checkbox" className="size-5" checked={typeTemp} onChange={(e) => setTypeTemp(e.target.checked)} />
            Type the temperature instead of the tank probe&apos;s {live?.temperature?.value.toFixed(1)} °C
          </label>
        )}
        {typeTemp || noTemp ? (
          <label className="block max-w-48 text-sm font-medium">
            Temperature °C
            <input className={input} name="tempC" inputMode="decimal" value={tempC} onChange={(e) => setTempC(e.target.value)} />
            {error?.fields.tempC ? <span className="text-xs text-bad">{error.fields.tempC}</span> : null}
          </label>
        ) : null}
      </div>
      {!stable ? (
        <div className="space-y-2">
          <label className="flex min-h-10 items-center gap-2 text-sm">
            <input type="checkbox" className="size-5" checked={early} onChange={(e) => setEarly(e.target.checked)} />
            Capture before the reading settles (needs a note)
          </label>
          {early ? (
            <label className="block text-sm font-medium">
              Note
              <input className={input} name="note" value={note} onChange={(e) => setNote(e.target.value)} placeholder="Why it is captured now" />
            </label>
          ) : null}
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="rounded-md border border-bad/40 bg-bad/5 p-3 text-sm font-medium text-bad">
          {error.message}
        </p>
      ) : null}
      {!online && !waiting ? (
        <p data-testid="capture-offline" className="flex items-start gap-2 rounded-md border border-warn/40 bg-warn/5 p-3 text-sm text-warn">
          <CloudOff className="mt-0.5 size-4 shrink-0" aria-hidden />
          <span>
            No connection. The reading shown is the last one received
            {live?.latest ? ` (${format(live.latest.ts, "HH:mm:ss")})` : ""}; a capture is kept on this device and the server
            judges that reading when the connection returns.
          </span>
        </p>
      ) : null}
      {waiting ? (
        <p data-testid="pending-point" role="status" className="flex items-start gap-2 rounded-md border border-held/40 bg-held/5 p-3 text-sm font-medium text-held">
          <CloudOff className="mt-0.5 size-4 shrink-0" aria-hidden />
          <span>
            Captured at {format(waiting.pressedAt, "HH:mm:ss")} and kept on this device. It is sent as soon as the
            connection returns; leave this page open or come back to it.
          </span>
        </p>
      ) : null}
      <Button type="submit" size="lg" disabled={!canCapture || Boolean(waiting)} className="w-full sm:w-auto">
        {waiting ? "Sending when the connection returns…" : stable ? "Capture this reading" : early ? "Capture with the note" : "Waiting for a stable reading…"}
      </Button>
    </form>
  );
}
